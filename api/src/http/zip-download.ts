/**
 * A zip download written while it is sent (issue 16, item 6): entries are added up front with a
 * loader each, and yazl asks for an entry's bytes only when the archive reaches it, so one entry
 * at a time is in memory and a slow client slows the database reads down (the pipe's backpressure)
 * instead of the server buffering the whole archive.
 */
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { Response } from 'express';
import yazl from 'yazl';
import { attachmentDisposition } from './content-disposition';

/** What a download adds to its archive. */
export interface ZipWriter {
  /** An entry whose bytes `load` reads when the archive reaches it. */
  addLazy(path: string, load: () => Promise<Buffer>, mtime?: Date): void;
  /** A small text entry (README, manifest), UTF-8. */
  addText(path: string, text: string, mtime?: Date): void;
}

/** yazl 3's lazy entries, which @types/yazl (written for yazl 2) does not declare. */
interface LazyZipFile {
  addReadStreamLazy(path: string, options: { mtime?: Date }, open: (cb: (err: Error | null, stream?: Readable) => void) => void): void;
}

/**
 * Answers `res` with a zip named `fileName`. `fill` adds the entries (it runs before the first
 * byte is sent, so it may still throw an AppError for a 4xx answer); the archive is then streamed.
 * A loader that fails after the first byte ends the connection, so the client sees a cut archive,
 * never a truncated one that looks whole (a zip's directory is written last).
 */
export async function sendZip(res: Response, fileName: string, fill: (zip: ZipWriter) => Promise<void> | void): Promise<void> {
  const zip = new yazl.ZipFile();
  const lazy = zip as unknown as LazyZipFile;
  await fill({
    addLazy(path, load, mtime) {
      lazy.addReadStreamLazy(path, mtime ? { mtime } : {}, (cb) => {
        load().then((bytes) => cb(null, Readable.from([bytes])), (err: unknown) => cb(err instanceof Error ? err : new Error(String(err))));
      });
    },
    addText(path, text, mtime) {
      zip.addBuffer(Buffer.from(text, 'utf8'), path, mtime ? { mtime } : {});
    },
  });
  res.set({ 'content-type': 'application/zip', 'content-disposition': attachmentDisposition(fileName) });
  const failed = new Promise<never>((_, reject) => zip.once('error', reject));
  zip.end();
  await Promise.race([pipeline(zip.outputStream as unknown as Readable, res), failed]).catch((err: unknown) => {
    res.destroy();
    // Past the first byte there is no error answer to give; the request log records it.
    res.req.log?.warn({ err }, 'zip download ended early');
  });
}
