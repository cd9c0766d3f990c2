import { createHash, randomBytes } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { link, mkdir, open, stat, unlink } from 'node:fs/promises';
import { dirname, join } from 'node:path';

/** Where stored files live and how bytes get there: content-addressed by SHA-256, written once, never changed. */
export interface FileStore {
  /** DATA_DIR/files */
  readonly root: string;
  /** DATA_DIR/tmp: uploads and renders in progress, never read as finished files. */
  readonly tmpDir: string;
  /** DATA_DIR/files/ab/cdef… for a hex SHA-256. */
  pathOf(sha256: string): string;
  /** A fresh name in the temp folder. */
  tempPath(suffix?: string): string;
  /**
   * Moves a finished temp file into the store under its hash. If the store already holds those bytes the temp file
   * is removed instead. Resolves to whether the bytes were new.
   */
  adopt(tempFile: string, sha256: string): Promise<{ created: boolean }>;
  /** Writes bytes to a temp name, flushes them to disk, and adopts them. */
  putBytes(bytes: Uint8Array): Promise<{ sha256: string; size: number; created: boolean }>;
  /** Removes a stored file (only for bytes no row refers to). */
  remove(sha256: string): Promise<void>;
}

const hexSha256 = /^[0-9a-f]{64}$/;

/** SHA-256 of bytes in memory, as lowercase hex. */
export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/**
 * Opens the file store under `dataDir`, creating its folders. Stored files are named by the SHA-256 of their bytes,
 * so the same bytes are kept once and a name never points at different bytes. Every write goes to DATA_DIR/tmp,
 * is flushed with fsync, then renamed into place, so a crash leaves either no file or the whole file.
 *
 * @example
 * const store = createFileStore(config.dataDir);
 * const { sha256 } = await store.putBytes(jpegBytes);
 * res.sendFile(store.pathOf(sha256));
 */
export function createFileStore(dataDir: string): FileStore {
  const root = join(dataDir, 'files');
  const tmpDir = join(dataDir, 'tmp');
  mkdirSync(root, { recursive: true });
  mkdirSync(tmpDir, { recursive: true });
  const pathOf = (sha256: string) => {
    if (!hexSha256.test(sha256))
      throw new TypeError(`Expected 64 hex digits for sha256 but received ${sha256}`);
    return join(root, sha256.slice(0, 2), sha256.slice(2));
  };
  const tempPath = (suffix = '') =>
    join(tmpDir, `${Date.now()}-${randomBytes(8).toString('hex')}${suffix}.part`);

  const adopt = async (tempFile: string, sha256: string) => {
    const target = pathOf(sha256);
    await mkdir(dirname(target), { recursive: true });
    try {
      // link fails when the target exists, so two writers of the same bytes never replace each other's file
      await link(tempFile, target);
      return { created: true };
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
      return { created: false };
    } finally {
      await unlink(tempFile).catch(() => undefined);
    }
  };

  return {
    root,
    tmpDir,
    pathOf,
    tempPath,
    adopt,
    async putBytes(bytes) {
      const sha256 = sha256Hex(bytes);
      const existing = await stat(pathOf(sha256)).catch(() => undefined);
      if (existing?.size === bytes.length) return { sha256, size: bytes.length, created: false };
      const temp = tempPath();
      const handle = await open(temp, 'wx');
      try {
        await handle.writeFile(bytes);
        await handle.sync();
      } catch (err) {
        await handle.close();
        await unlink(temp).catch(() => undefined);
        throw err;
      }
      await handle.close();
      const { created } = await adopt(temp, sha256);
      return { sha256, size: bytes.length, created };
    },
    async remove(sha256) {
      await unlink(pathOf(sha256)).catch(() => undefined);
    },
  };
}
