/** Turns the multipart files of one upload into map and scenario entries, opening zip archives. */
import { UPLOAD_LIMITS, type UploadProblem } from '@shared/instance-sets';
import { ByteBudget } from './byte-budget';
import { readZip } from './read-zip';
import { entryKind, fileProblem, isZipName, unsafePathReason, type UploadEntry } from './upload-entry';

/** A file as received (multer's memory storage gives originalname and buffer). */
export interface ReceivedFile {
  readonly originalname: string;
  readonly buffer: Buffer;
}

/** Every entry of an upload, the archive entries passed over, and the problems found so far. */
export interface CollectedUpload {
  readonly entries: readonly UploadEntry[];
  readonly skipped: readonly string[];
  readonly problems: readonly UploadProblem[];
  /** Whether the upload ran past UPLOAD_LIMITS.maxTotalBytes (its files are then not worth parsing). */
  readonly isOverBudget: boolean;
}

/** Collects entries from plain `.map`/`.scen` files and `.zip` archives, within UPLOAD_LIMITS. */
export async function collectUpload(files: readonly ReceivedFile[]): Promise<CollectedUpload> {
  const budget = new ByteBudget(UPLOAD_LIMITS.maxTotalBytes);
  const entries: UploadEntry[] = [];
  const skipped: string[] = [];
  const problems: UploadProblem[] = [];
  if (files.length === 0) problems.push(fileProblem('(upload)', 'no files were sent'));
  for (const file of files) {
    const name = file.originalname;
    const unsafe = unsafePathReason(name);
    if (unsafe) {
      problems.push(fileProblem(name, `the file is refused: ${unsafe}`));
      continue;
    }
    if (isZipName(name)) {
      const zip = await readZip(name, file.buffer, budget);
      entries.push(...zip.entries);
      skipped.push(...zip.skipped);
      problems.push(...zip.problems);
      continue;
    }
    if (name.includes('/')) {
      problems.push(fileProblem(name, 'send plain files without folders (or put folders in a .zip)'));
      continue;
    }
    if (!entryKind(name)) {
      problems.push(fileProblem(name, 'only .map and .scen files, or a .zip of them, are accepted'));
      continue;
    }
    if (!budget.take(file.buffer.length)) {
      problems.push(fileProblem(name, `the upload is more than ${UPLOAD_LIMITS.maxTotalBytes} bytes in all; nothing was stored`));
      break;
    }
    entries.push({ name, label: name, bytes: file.buffer });
  }
  return { entries, skipped, problems, isOverBudget: budget.isExhausted };
}
