import type { Request } from 'express';
import { createHash } from 'node:crypto';
import { createWriteStream } from 'node:fs';
import { unlink } from 'node:fs/promises';
import { Transform } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { StorageEngine } from 'multer';

/** What the storage engine adds to each uploaded file. */
export interface HashedUpload {
  /** Temp file under DATA_DIR/tmp holding the bytes (removed and empty when `tooLarge`). */
  path: string;
  size: number;
  /** Hex SHA-256 of the bytes, computed while they streamed to disk. */
  sha256: string;
  /** The file was longer than the limit: its bytes were drained and dropped, nothing kept. */
  tooLarge: boolean;
}

/**
 * A multer storage engine that streams each file to a fresh temp name, hashing it on the way and flushing it to disk
 * before reporting it stored. A file longer than `maxFileBytes` is drained and dropped instead of failing the whole
 * request, so the other files of the upload are still judged on their own.
 *
 * @example
 * multer({ storage: hashingDiskStorage({ tempPath: () => store.tempPath(), maxFileBytes: 1 << 30 }) })
 */
export function hashingDiskStorage(options: { tempPath: () => string; maxFileBytes: number }): StorageEngine {
  return {
    _handleFile(_req: Request, file, cb) {
      const path = options.tempPath();
      const hash = createHash('sha256');
      let size = 0;
      let tooLarge = false;
      const meter = new Transform({
        transform(chunk: Buffer, _encoding, done) {
          size += chunk.length;
          if (tooLarge || size > options.maxFileBytes) {
            tooLarge = true;
            done();
            return;
          }
          hash.update(chunk);
          done(null, chunk);
        },
      });
      // flush: fsync before close, so a stored upload survives a power cut (Node ≥ 20.10)
      const out = createWriteStream(path, { flags: 'wx', flush: true });
      pipeline(file.stream, meter, out).then(
        async () => {
          if (tooLarge) await unlink(path).catch(() => undefined);
          const info: HashedUpload = { path, size, sha256: hash.digest('hex'), tooLarge };
          cb(null, info as never);
        },
        async (err: unknown) => {
          await unlink(path).catch(() => undefined);
          cb(err);
        },
      );
    },
    _removeFile(_req: Request, file, cb) {
      unlink(file.path).then(
        () => cb(null),
        () => cb(null),
      );
    },
  };
}
