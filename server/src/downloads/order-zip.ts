import { ZipArchive } from 'archiver';
import type { Response } from 'express';
import { basename, extname } from 'node:path';
import type { FileStore } from '../files/file-store';
import { POSITIVE_EXTENSIONS } from '../imaging/index';
import type { FinishedFrame } from './finished-frames';

/** The name of one finished file inside the zip and on its own: `roll-1/scan-007.jpg`. */
export function finishedFileName(
  frame: FinishedFrame,
  format: FinishedFrame['outputs'][number]['format'],
): string {
  const stem = basename(frame.fileName, extname(frame.fileName));
  return `roll-${frame.rollNumber}/${stem}${POSITIVE_EXTENSIONS[format]}`;
}

/**
 * Streams the finished files of the frames as a zip into the response, read from the store one file at a time: the
 * archive is never held whole in memory or written to disk. Entries are stored, not deflated — JPEG and the
 * deflate-compressed TIFF/PNG outputs are already compressed. A client that goes away stops the archive.
 *
 * @example
 * streamOrderZip(res, store, frames, 'order-12-scans.zip');
 */
export function streamOrderZip(
  res: Response,
  store: FileStore,
  frames: FinishedFrame[],
  zipName: string,
): void {
  // one stat at a time: with more, archiver queues files in the order their stats finish, not the order given
  const archive = new ZipArchive({ store: true, statConcurrency: 1 });
  res.status(200);
  res.type('application/zip');
  res.attachment(zipName);
  res.set('Cache-Control', 'private, no-store');
  archive.on('error', (err) => res.destroy(err));
  res.on('close', () => {
    if (!res.writableFinished) archive.abort();
  });
  archive.pipe(res);
  const used = new Set<string>();
  for (const frame of frames) {
    for (const output of frame.outputs) {
      let name = finishedFileName(frame, output.format);
      // two scans of a roll may share a file name from different folders: keep both
      if (used.has(name)) name = name.replace(/(\.[^.]+)$/, `-frame-${frame.id}$1`);
      used.add(name);
      archive.file(store.pathOf(output.sha256), { name });
    }
  }
  void archive.finalize();
}
