import type {
  Frame,
  FrameBaseRequest,
  MeasuredBase,
  PixelRegion,
  Roll,
  RollBaseRequest,
  User,
} from '@clearbase/contracts';
import type { RgbImage } from '@clearbase/inversion';
import type { Kysely } from 'kysely';
import type { Clock } from '../clock';
import type { Database } from '../db/database';
import { AppError } from '../errors/app-error';
import type { FileStore } from '../files/file-store';
import { loadFrameFor } from '../frames/frame-access';
import { frameNegative } from '../frames/frame-negative';
import { findFrameById, listFramesOfRoll, outputFormatsOfFrames, toFrame } from '../frames/frame-repository';
import type { FrameRow } from '../frames/frame-tables';
import type { RollRow } from '../rolls/roll-tables';
import { recordOrderAudit } from '../orders/record-order-audit';
import { assertRegionInside } from '../rolls/region-check';
import { loadRollFor, scannerProfileOf } from '../rolls/roll-access';
import { findRollById, toRoll } from '../rolls/roll-repository';
import { chooseFilmBase, type FilmBaseChoice } from './choose-film-base';
import {
  baseFactsOfFrame,
  baseFactsOfRoll,
  saveFrameBase,
  saveRollBase,
  saveRollMeasuredBase,
} from './film-base-repository';
import { measureNegativeBase } from './measure-film-base';
import { medianOfFrameBases, rollFilmBase } from './roll-film-base';

export interface FilmBaseServiceDeps {
  db: Kysely<Database>;
  store: FileStore;
  clock: Clock;
  /** The largest scan decoded to measure a base, pixels (the upload limit). */
  maxPixels: number;
}

export type FilmBaseService = ReturnType<typeof createFilmBaseService>;

/** Refuses a drawn rectangle in which no film was found; `where` names what to draw it over instead. */
function assertFilmIn(measured: MeasuredBase | null, where: string): asserts measured is MeasuredBase {
  if (!measured || measured.confidence === 0) {
    throw new AppError(
      'no-film-in-region',
      422,
      `The rectangle holds no film (only bare light or dust); draw it over unexposed film such as ${where}.`,
      [{ path: 'body.region', message: 'No film in this rectangle' }],
    );
  }
}

/**
 * Which film base each frame renders with, written once: a roll's base, the choice for a frame (`chooseFilmBase`),
 * and an operator's setting of a roll's or a frame's base, measured, stored and audited in one transaction.
 *
 * @example
 * const filmBase = createFilmBaseService({ db, store, clock, maxPixels: config.uploads.maxPixels });
 * const choice = filmBase.choose(frame, filmBase.rollBase(roll, frames));
 */
export function createFilmBaseService({ db, store, clock, maxPixels }: FilmBaseServiceDeps) {
  const measureOn = async (negative: RgbImage, roll: RollRow, region: PixelRegion | null) =>
    measureNegativeBase(negative, await scannerProfileOf(db, roll.scanner_id), region);

  return {
    /** The base the roll's frames fall back on: its leader rectangle, else the median of `frames`' own bases. */
    rollBase(roll: RollRow, frames: readonly FrameRow[]): MeasuredBase | null {
      return rollFilmBase(baseFactsOfRoll(roll), frames.map(baseFactsOfFrame));
    },

    /** The base `frame` renders with, given its roll's base (`chooseFilmBase`). */
    choose(frame: FrameRow, rollBase: MeasuredBase | null): FilmBaseChoice {
      return chooseFilmBase(baseFactsOfFrame(frame), rollBase);
    },

    /**
     * The base `frame` renders with now, against the base its roll's frames give today. A frame with no base on file
     * (not measured on upload) is measured by `measureOwn` first, which answers null when it finds none.
     */
    async chooseForFrame(
      frame: FrameRow,
      roll: RollRow,
      measureOwn: () => Promise<MeasuredBase | null>,
    ): Promise<FilmBaseChoice> {
      const own = frame.base_measured === null ? await measureOwn() : undefined;
      const rollBase = rollFilmBase(
        baseFactsOfRoll(roll),
        (await listFramesOfRoll(db, roll.id)).map(baseFactsOfFrame),
      );
      const facts = baseFactsOfFrame(frame);
      return chooseFilmBase(own === undefined ? facts : { ...facts, measured: own }, rollBase);
    },

    /**
     * Keeps an automatic roll base following its frames (after new scans): stores the median of their bases. A roll
     * whose base was drawn keeps it.
     */
    async followFrames(roll: RollRow): Promise<void> {
      if (roll.base_mode !== 'auto') return;
      const frames = await listFramesOfRoll(db, roll.id);
      await saveRollMeasuredBase(db, roll.id, medianOfFrameBases(frames.map(baseFactsOfFrame)));
    },

    /**
     * Sets a roll's base for `actor`: automatic (the median of its frames' bases) or a rectangle on one of its frames.
     * Throws 404 for a roll or frame not found, 422 for a rectangle outside the scan or holding no film.
     */
    async setRollBase(actor: User, rollId: number, request: RollBaseRequest): Promise<Roll> {
      const roll = await loadRollFor(db, rollId, actor);
      const frames = await listFramesOfRoll(db, roll.id);
      let measured: MeasuredBase | null;
      if (request.mode === 'region') {
        const frame = frames.find((f) => f.id === request.frameId);
        if (!frame) {
          throw new AppError(
            'frame-not-found',
            404,
            `Roll ${roll.id} has no frame with id ${request.frameId}.`,
          );
        }
        assertRegionInside(request.region, frame.width, frame.height, 'body.region');
        const negative = await frameNegative(db, store, frame, maxPixels);
        measured = await measureOn(negative, roll, request.region);
        assertFilmIn(measured, 'the leader or rebate');
      } else {
        measured = medianOfFrameBases(frames.map(baseFactsOfFrame));
      }
      return db.transaction().execute(async (trx) => {
        const at = clock.now();
        const region = request.mode === 'region' ? request : null;
        await saveRollBase(
          trx,
          roll.id,
          {
            mode: request.mode,
            frameId: region?.frameId ?? null,
            region: region?.region ?? null,
            measured,
          },
          at,
        );
        const after = toRoll((await findRollById(trx, roll.id))!);
        await recordOrderAudit(trx, {
          at,
          actor,
          action: 'roll-base-changed',
          target: `roll:${roll.id}`,
          details: { before: toRoll(roll).base, after: after.base },
        });
        return after;
      });
    },

    /**
     * Sets a frame's base for `actor`: automatic (detected on its scan) or a rectangle over unexposed film. Throws 404
     * for a frame not found, 422 for a rectangle outside the scan or holding no film.
     */
    async setFrameBase(actor: User, frameId: number, request: FrameBaseRequest): Promise<Frame> {
      const frame = await loadFrameFor(db, frameId, actor);
      const roll = (await findRollById(db, frame.roll_id))!;
      const region = request.mode === 'region' ? request.region : null;
      if (region) assertRegionInside(region, frame.width, frame.height, 'body.region');
      const negative = await frameNegative(db, store, frame, maxPixels);
      let measured: MeasuredBase | null = null;
      try {
        measured = await measureOn(negative, roll, region);
      } catch {
        // an automatic base not found is the render's QC matter; a rectangle is refused just below
        measured = null;
      }
      if (region) assertFilmIn(measured, 'the rebate');
      const updated = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        await saveFrameBase(trx, frame.id, { mode: request.mode, region, measured });
        const after = (await findFrameById(trx, frame.id))!;
        await recordOrderAudit(trx, {
          at,
          actor,
          action: 'frame-base-changed',
          target: `frame:${frame.id}`,
          details: { before: toFrame(frame).base, after: toFrame(after).base },
        });
        return after;
      });
      const outputs = await outputFormatsOfFrames(db, [frame.id]);
      return toFrame(updated, outputs.get(frame.id));
    },
  };
}
