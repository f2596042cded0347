/**
 * One file of an upload after archives are opened, and the checks every file name passes:
 * no absolute paths, no `..` segments, no backslashes (a Windows separator some unzip tools
 * honour), so a stored name can never point outside the set.
 */
import type { UploadProblem } from '@shared/instance-sets';

/** A file to check and store: its base name and bytes, and where it came from (for messages). */
export interface UploadEntry {
  /** Base name, e.g. `empty-8-8.map`. */
  readonly name: string;
  /** `empty-8-8.map` for a plain file, `bundle.zip:maps/empty-8-8.map` for an archive entry. */
  readonly label: string;
  readonly bytes: Buffer;
}

/** The kinds of file the library stores, by extension. */
export type EntryKind = 'map' | 'scenario';

/** The kind of a file name by its extension (case-insensitive), or undefined for any other file. */
export function entryKind(name: string): EntryKind | undefined {
  const lower = name.toLowerCase();
  if (lower.endsWith('.map')) return 'map';
  if (lower.endsWith('.scen')) return 'scenario';
  return undefined;
}

/** Whether a file name is a zip archive by its extension. */
export function isZipName(name: string): boolean {
  return name.toLowerCase().endsWith('.zip');
}

/** Why a client-supplied path is refused, or null when it is safe. */
export function unsafePathReason(path: string): string | null {
  if (path === '') return 'the name is empty';
  if (path.includes('\0')) return 'the name contains a NUL character';
  if (path.includes('\\')) return 'the name contains a backslash';
  if (path.startsWith('/') || /^[A-Za-z]:/.test(path)) return 'the name is an absolute path';
  if (path.split('/').includes('..')) return "the name climbs out of its folder with '..'";
  return null;
}

/** The last segment of a slash-separated path. */
export function baseName(path: string): string {
  const parts = path.split('/');
  return parts[parts.length - 1];
}

/** A problem about a whole file (line and column 0). */
export function fileProblem(file: string, message: string): UploadProblem {
  return { file, line: 0, column: 0, message };
}

/**
 * Decodes a file as UTF-8 text, or reports the line and column of the first byte sequence
 * that is not UTF-8 (both formats are ASCII in practice, so such a byte is a real mistake).
 */
export function decodeText(entry: UploadEntry): { readonly text: string } | { readonly problem: UploadProblem } {
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(entry.bytes) };
  } catch {
    const loose = new TextDecoder('utf-8').decode(entry.bytes);
    const at = loose.indexOf('\uFFFD');
    const before = loose.slice(0, Math.max(at, 0));
    const line = before.split('\n').length;
    const column = before.length - before.lastIndexOf('\n');
    return { problem: { file: entry.label, line, column, message: 'the file is not UTF-8 text (an invalid byte sequence starts here)' } };
  }
}
