/**
 * Opens an uploaded zip archive with yauzl and returns its `.map` and `.scen` entries, guarding
 * against zip bombs: at most UPLOAD_LIMITS.maxArchiveEntries entries, each entry's real size
 * checked against its header (yauzl's validateEntrySizes), and a running count of the bytes
 * actually inflated that stops reading as soon as the upload's budget is spent.
 */
import * as yauzl from 'yauzl';
import { UPLOAD_LIMITS, type UploadProblem } from '@shared/instance-sets';
import type { ByteBudget } from './byte-budget';
import { baseName, entryKind, fileProblem, unsafePathReason, type UploadEntry } from './upload-entry';

/** What an archive held. */
export interface ZipContents {
  readonly entries: readonly UploadEntry[];
  /** Entries that are neither maps nor scenarios, by their path in the archive. */
  readonly skipped: readonly string[];
  readonly problems: readonly UploadProblem[];
}

/** yauzl exports this in 3.x, but @types/yauzl (written for 2.x) does not declare it. */
const decodeName = (yauzl as unknown as {
  getFileNameLowLevel(flag: number, raw: Buffer, extra: unknown, strict: boolean): string;
}).getFileNameLowLevel;

/**
 * Reads the archive `archiveName`; bytes of kept entries are charged to `budget`. `keep` picks the
 * entries by file name (default: maps and scenarios; field trial uploads keep .csv and .json).
 */
export function readZip(
  archiveName: string, buffer: Buffer, budget: ByteBudget, keep: (name: string) => boolean = (name) => Boolean(entryKind(name)),
): Promise<ZipContents> {
  const entries: UploadEntry[] = [];
  const skipped: string[] = [];
  const problems: UploadProblem[] = [];
  const done = (): ZipContents => ({ entries, skipped, problems });
  const fail = (message: string): void => {
    problems.push(fileProblem(archiveName, message));
  };

  return new Promise((resolve) => {
    // decodeStrings off: yauzl would otherwise abort the whole archive on the first unsafe
    // name; we decode names ourselves and report each unsafe one by name.
    yauzl.fromBuffer(buffer, { lazyEntries: true, decodeStrings: false, validateEntrySizes: true }, (openErr, zip) => {
      if (openErr || !zip) {
        fail(`not a readable zip archive (${openErr?.message ?? 'unknown error'})`);
        resolve(done());
        return;
      }
      let count = 0;
      let isStopped = false;
      const stop = (): void => {
        isStopped = true;
        zip.close();
        resolve(done());
      };
      zip.on('error', (err: Error) => {
        if (isStopped) return;
        fail(`the archive is damaged (${err.message})`);
        stop();
      });
      zip.on('end', () => {
        if (!isStopped) stop();
      });
      zip.on('entry', (entry: yauzl.Entry) => {
        count++;
        if (count > UPLOAD_LIMITS.maxArchiveEntries) {
          fail(`the archive holds more than ${UPLOAD_LIMITS.maxArchiveEntries} entries`);
          stop();
          return;
        }
        const path = decodeName(entry.generalPurposeBitFlag, entry.fileName as unknown as Buffer, entry.extraFields, true);
        const unsafe = unsafePathReason(path);
        if (unsafe) {
          fail(`entry '${path}' is refused: ${unsafe}`);
          zip.readEntry();
          return;
        }
        const name = baseName(path);
        // Directories, macOS resource forks and anything that is not a map or scenario are passed over.
        if (path.endsWith('/') || path.startsWith('__MACOSX/') || name.startsWith('._')) {
          zip.readEntry();
          return;
        }
        if (!keep(name)) {
          skipped.push(path);
          zip.readEntry();
          return;
        }
        const label = `${archiveName}:${path}`;
        if (entry.uncompressedSize > UPLOAD_LIMITS.maxFileBytes) {
          problems.push(fileProblem(label, `the file is ${entry.uncompressedSize} bytes unzipped; at most ${UPLOAD_LIMITS.maxFileBytes} are accepted`));
          zip.readEntry();
          return;
        }
        zip.openReadStream(entry, (streamErr, stream) => {
          if (streamErr || !stream) {
            problems.push(fileProblem(label, `the entry cannot be read (${streamErr?.message ?? 'unknown error'})`));
            stop();
            return;
          }
          const chunks: Buffer[] = [];
          let isOver = false;
          stream.on('data', (chunk: Buffer) => {
            if (isOver) return;
            // Counted while inflating, so a header that lies about the size cannot get past the limit.
            if (!budget.take(chunk.length)) {
              isOver = true;
              fail(`the upload expands to more than ${budget.limit} bytes in all; nothing was stored`);
              stream.destroy();
              stop();
              return;
            }
            chunks.push(chunk);
          });
          stream.on('error', (err: Error) => {
            if (isOver || isStopped) return;
            problems.push(fileProblem(label, `the entry cannot be unzipped (${err.message})`));
            stop();
          });
          stream.on('end', () => {
            if (isOver || isStopped) return;
            entries.push({ name, label, bytes: Buffer.concat(chunks) });
            zip.readEntry();
          });
        });
      });
      zip.readEntry();
    });
  });
}
