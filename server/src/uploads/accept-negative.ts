import type { AcceptedUpload, RejectedUpload, ScannerProfile } from '@clearbase/contracts';
import { neutralAdjustments } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import { open, unlink } from 'node:fs/promises';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { findFileBySha, recordFile } from '../files/file-repository';
import type { FileStore } from '../files/file-store';
import { findFrameOfRollByFile, insertFrame, nextFrameIndex } from '../frames/frame-repository';
import { ImageInputError, sniffFormat } from '../imaging/index';
import type { HashedUpload } from './hashing-disk-storage';
import { validateNegative, type ValidatedNegative } from './validate-negative';
import type { ValidationBudget } from './validation-budget';

const mediaTypes = { tiff: 'image/tiff', png: 'image/png' } as const;

async function headOf(path: string): Promise<Uint8Array> {
  const handle = await open(path, 'r');
  try {
    const head = new Uint8Array(16);
    const { bytesRead } = await handle.read(head, 0, head.length, 0);
    return head.subarray(0, bytesRead);
  } finally {
    await handle.close();
  }
}

/**
 * Judges one uploaded file and, when it is a usable negative scan, moves it into the store and records it as the
 * roll's next frame in one transaction. A rejected file is removed from the temp folder and leaves no row.
 * Accepted: a real TIFF or PNG, RGB, 8 or 16 bits, within the pixel limit, decodable to the end. The pixels are
 * checked within `budget` and without holding the frame (`validateNegative`).
 */
export async function acceptNegative(
  deps: { db: Kysely<Database>; store: FileStore; clock: Clock; budget: ValidationBudget },
  upload: HashedUpload & { fileName: string },
  roll: { id: number; scanner: ScannerProfile; maxFileBytes: number; maxPixels: number },
): Promise<{ accepted: AcceptedUpload } | { rejected: RejectedUpload }> {
  const { db, store, clock, budget } = deps;
  const reject = (code: string, reason: string) => ({
    rejected: { fileName: upload.fileName, code, reason },
  });
  try {
    if (upload.tooLarge) {
      return reject(
        'file-too-large',
        `The file is larger than the limit of ${roll.maxFileBytes} bytes per scan.`,
      );
    }
    if (upload.size > 0 && sniffFormat(await headOf(upload.path)) === 'jpeg') {
      return reject(
        'unsupported-format',
        'The file is a JPEG: 8 bits per channel with lossy compression. Upload the scan as a 16-bit TIFF or PNG.',
      );
    }
    let validated: ValidatedNegative;
    try {
      validated = await validateNegative(upload.path, {
        maxPixels: roll.maxPixels,
        budget,
        scanner: roll.scanner,
      });
    } catch (err) {
      if (err instanceof ImageInputError) return reject(err.code, err.message);
      throw err;
    }
    const { header: negative, base } = validated;
    if (negative.format === 'jpeg') {
      return reject('unsupported-format', 'The file is a JPEG; upload the scan as a 16-bit TIFF or PNG.');
    }
    const known = await findFileBySha(db, upload.sha256);
    if (known) {
      const twin = await findFrameOfRollByFile(db, roll.id, known.id);
      if (twin) {
        return reject('duplicate-scan', `The same scan is already frame ${twin.frame_index} of this roll.`);
      }
    }
    const { created } = await store.adopt(upload.path, upload.sha256);
    try {
      const frame = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        const file = await recordFile(trx, {
          sha256: upload.sha256,
          size: upload.size,
          mediaType: mediaTypes[negative.format as 'tiff' | 'png'],
          at,
        });
        const row = await insertFrame(trx, {
          rollId: roll.id,
          index: await nextFrameIndex(trx, roll.id),
          sourceFileId: file.id,
          fileName: upload.fileName,
          width: negative.width,
          height: negative.height,
          bitDepth: negative.bitDepth,
          warnings: negative.warnings,
          adjustments: neutralAdjustments,
          at,
        });
        if (base) {
          await trx
            .updateTable('frames')
            .set({ base_measured: JSON.stringify(base) })
            .where('id', '=', row.id)
            .execute();
        }
        return row;
      });
      return {
        accepted: {
          fileName: upload.fileName,
          frameId: frame.id,
          index: frame.frame_index,
          duplicate: !created,
          warnings: negative.warnings,
        },
      };
    } catch (err) {
      if (created) await store.remove(upload.sha256);
      throw err;
    }
  } finally {
    // adopt removed it already when accepted; a rejected file goes here
    await unlink(upload.path).catch(() => undefined);
  }
}
