import {
  validateProfileDocument,
  type CreateProfileRequest,
  type Profile,
  type ProfileDiff,
  type ProfileDocument,
  type ProfileVersion,
  type User,
} from '@clearbase/contracts';
import { randomUUID } from 'node:crypto';
import type { Kysely, Updateable } from 'kysely';
import type { Clock } from '../clock';
import type { Database, ProfileRow, ProfileVersionRow } from '../db/database';
import { AppError } from '../errors/app-error';
import { findScannerById } from '../scanners/scanner-repository';
import { findStockById, findStockByName } from '../stocks/stock-repository';
import { defaultProfileDocument } from './default-profile-document';
import { diffDocuments } from './diff-documents';
import {
  findProfileByDocumentId,
  findProfileById,
  findVersionById,
  findVersionOfProfile,
  insertDraft,
  insertProfile,
  listProfilesOfStock,
  listVersionsOfProfiles,
  stamped,
  toProfile,
  toVersion,
  toVersionSummary,
  updateDraftParameters,
  updateVersionStatus,
} from './profile-repository';
import { recordCatalogueAudit, type CatalogueAuditAction } from './record-catalogue-audit';

export interface ProfilesDeps {
  db: Kysely<Database>;
  clock: Clock;
}

/** A new profile with its first draft, as creating or importing one answers. */
export interface StartedProfile {
  profile: Profile;
  version: ProfileVersion;
}

/** What an import made: a new profile, or a new draft of the profile the document already belongs to. */
export type ImportedProfile = StartedProfile & { created: 'profile' | 'draft' };

function versionNotFound(id: number): AppError {
  return new AppError('profile-version-not-found', 404, `No profile version with id ${id}.`);
}

function frozen(row: ProfileVersionRow): AppError {
  return new AppError(
    'profile-version-immutable',
    409,
    `Version ${row.version} is ${row.status} and cannot change; make a new draft from it instead.`,
  );
}

/** Version rows as documents without their labels: id and version always differ between two versions. */
function parametersOf(row: ProfileVersionRow): Omit<ProfileDocument, 'id' | 'version'> {
  const { id: _id, version: _version, ...rest } = JSON.parse(row.parameters) as ProfileDocument;
  return rest;
}

/**
 * Stock profiles and their versions: a profile starts with a draft, drafts change, publishing freezes a version
 * and retiring sets it aside. Every change runs in one transaction and is audited with what it was and became.
 * @example const profiles = createProfilesService({ db, clock }); await profiles.publish(manager, 7, 'Warmer greens');
 */
export function createProfilesService({ db, clock }: ProfilesDeps) {
  /** Adds a draft to a profile and audits it as `action` on the new version, recording what `record` makes of it. */
  async function addDraft(
    trx: Kysely<Database>,
    actor: User,
    draft: { profile: ProfileRow; parentVersionId: number | null; parameters: ProfileDocument; at: Date },
    action: CatalogueAuditAction,
    record: (version: ProfileVersionRow) => unknown,
  ): Promise<ProfileVersionRow> {
    const version = await insertDraft(trx, { ...draft, by: actor.id });
    await recordCatalogueAudit(trx, {
      at: draft.at,
      actor,
      action,
      target: `profile-version:${version.id}`,
      before: null,
      after: record(version),
    });
    return version;
  }

  /** Makes a profile with its version 1 draft, audited as `action` on the profile with the answer `answer` makes. */
  async function startProfile<T>(
    trx: Kysely<Database>,
    actor: User,
    start: {
      stockId: number;
      scannerId: number | null;
      name: string;
      documentId: string;
      parameters: ProfileDocument;
      at: Date;
    },
    action: CatalogueAuditAction,
    answer: (started: StartedProfile) => T,
  ): Promise<T> {
    const { parameters, at, ...identity } = start;
    const profile = await insertProfile(trx, { ...identity, at, by: actor.id });
    const draft = await insertDraft(trx, { profile, parentVersionId: null, parameters, at, by: actor.id });
    const result = answer({ profile: toProfile(profile), version: toVersion(draft) });
    await recordCatalogueAudit(trx, {
      at,
      actor,
      action,
      target: `profile:${profile.id}`,
      before: null,
      after: result,
    });
    return result;
  }

  /** Moves a version on to its next status and audits the change with the summaries before and after. */
  async function changeStatus(
    actor: User,
    id: number,
    allowed: (row: ProfileVersionRow) => AppError | null,
    action: 'profile-version-published' | 'profile-version-retired',
    set: (at: string) => Updateable<Database['profile_versions']>,
  ): Promise<ProfileVersion> {
    return db.transaction().execute(async (trx) => {
      const row = await findVersionById(trx, id);
      if (!row) throw versionNotFound(id);
      const refused = allowed(row);
      if (refused) throw refused;
      const at = clock.now();
      const updated = await updateVersionStatus(trx, row.id, set(at.toISOString()));
      await recordCatalogueAudit(trx, {
        at,
        actor,
        action,
        target: `profile-version:${row.id}`,
        before: toVersionSummary(row),
        after: toVersionSummary(updated),
      });
      return toVersion(updated);
    });
  }

  async function loadVersion(id: number): Promise<ProfileVersionRow> {
    const row = await findVersionById(db, id);
    if (!row) throw versionNotFound(id);
    return row;
  }

  return {
    /**
     * Creates a profile for a C-41 stock with its version 1 draft: the given parameters, else neutral defaults.
     * Throws AppError 404 for an unknown stock or scanner and 422 (process-not-supported) for another process.
     */
    async create(actor: User, request: CreateProfileRequest): Promise<StartedProfile> {
      const stock = await findStockById(db, request.stockId);
      if (!stock) throw new AppError('stock-not-found', 404, `No stock with id ${request.stockId}.`);
      if (request.scannerId !== null && !(await findScannerById(db, request.scannerId))) {
        throw new AppError('scanner-not-found', 404, `No scanner with id ${request.scannerId}.`);
      }
      if (stock.process !== 'C-41') {
        throw new AppError(
          'process-not-supported',
          422,
          `Profiles invert C-41 stocks; ${stock.name} is ${stock.process}.`,
        );
      }
      const documentId = randomUUID();
      return db.transaction().execute((trx) =>
        startProfile(
          trx,
          actor,
          {
            stockId: stock.id,
            scannerId: request.scannerId,
            name: request.name,
            documentId,
            parameters: request.parameters ?? defaultProfileDocument(stock, documentId),
            at: clock.now(),
          },
          'profile-created',
          (started) => started,
        ),
      );
    },

    /**
     * Imports a profile document: a new draft of the profile it came from when this lab has that profile (its
     * parent the version the document names, where it exists), else a new profile of the stock the document names.
     * Throws AppError 400 (profile-document-invalid) with each field's path, and 422 (stock-not-found) when no
     * stock has the document's stock name.
     */
    async importDocument(actor: User, json: unknown): Promise<ImportedProfile> {
      const checked = validateProfileDocument(json);
      if (!checked.ok) {
        throw new AppError(
          'profile-document-invalid',
          400,
          'The profile document does not match the schema.',
          checked.errors,
        );
      }
      const document = checked.value;
      return db.transaction().execute(async (trx) => {
        const at = clock.now();
        const existing = await findProfileByDocumentId(trx, document.id);
        if (existing) {
          const parent = await findVersionOfProfile(trx, existing.id, document.version);
          const made = (draft: ProfileVersionRow): ImportedProfile => ({
            created: 'draft',
            profile: toProfile(existing),
            version: toVersion(draft),
          });
          const draft = await addDraft(
            trx,
            actor,
            { profile: existing, parentVersionId: parent?.id ?? null, parameters: document, at },
            'profile-imported',
            made,
          );
          return made(draft);
        }
        const stock = await findStockByName(trx, document.stock.name);
        if (!stock) {
          throw new AppError(
            'stock-not-found',
            422,
            `No stock named ${document.stock.name}; add the stock to the catalogue first.`,
            [{ path: 'stock.name', message: 'no stock of this name in the catalogue' }],
          );
        }
        return startProfile(
          trx,
          actor,
          {
            stockId: stock.id,
            scannerId: null,
            name: `${stock.name} (imported)`,
            documentId: document.id,
            parameters: document,
            at,
          },
          'profile-imported',
          (started): ImportedProfile => ({ created: 'profile', ...started }),
        );
      });
    },

    /**
     * Files a calibration's fitted document: a new draft of the stock's newest profile for that scanner, or, when it
     * has none, a new profile with the document as its version 1 draft; audited with the calibration's id. Runs in
     * the caller's transaction, beside the calibration's own record.
     */
    async draftFromCalibration(
      trx: Kysely<Database>,
      actor: User,
      fitted: {
        stock: { id: number; name: string };
        scannerId: number | null;
        parameters: ProfileDocument;
        calibrationId: number;
        at: Date;
      },
    ): Promise<{ profileId: number; versionId: number; created: 'profile' | 'draft' }> {
      const { stock, scannerId, parameters, calibrationId, at } = fitted;
      const existing = (await listProfilesOfStock(trx, stock.id))
        .filter((p) => p.scanner_id === scannerId)
        .at(-1);
      if (existing) {
        const latest = (await listVersionsOfProfiles(trx, [existing.id])).at(-1);
        const draft = await addDraft(
          trx,
          actor,
          { profile: existing, parentVersionId: latest?.id ?? null, parameters, at },
          'profile-version-created',
          (version) => ({ profileId: existing.id, version: toVersionSummary(version), calibrationId }),
        );
        return { profileId: existing.id, versionId: draft.id, created: 'draft' };
      }
      return startProfile(
        trx,
        actor,
        {
          stockId: stock.id,
          scannerId,
          name: `${stock.name} (calibrated)`,
          documentId: randomUUID(),
          parameters,
          at,
        },
        'profile-created',
        // recorded in the audit line as it is answered, with the calibration that made it
        (started) => ({
          profileId: started.profile.id,
          versionId: started.version.id,
          created: 'profile' as const,
          calibrationId,
        }),
      );
    },

    /** Makes a new draft from any version of the same profile. Throws AppError 404 for an unknown profile or version. */
    async draftFrom(actor: User, profileId: number, parentVersionId: number): Promise<ProfileVersion> {
      const profile = await findProfileById(db, profileId);
      if (!profile) throw new AppError('profile-not-found', 404, `No profile with id ${profileId}.`);
      const parent = await findVersionById(db, parentVersionId);
      if (!parent || parent.profile_id !== profile.id) {
        throw new AppError(
          'profile-version-not-found',
          404,
          `Profile ${profile.id} has no version with id ${parentVersionId}.`,
        );
      }
      return db.transaction().execute(async (trx) => {
        const parameters = JSON.parse(parent.parameters) as ProfileDocument;
        const draft = await addDraft(
          trx,
          actor,
          { profile, parentVersionId: parent.id, parameters, at: clock.now() },
          'profile-version-created',
          toVersionSummary,
        );
        return toVersion(draft);
      });
    },

    /** Replaces a draft's parameters. Throws AppError 404 for an unknown version and 409 for one not a draft. */
    async updateDraft(actor: User, id: number, parameters: ProfileDocument): Promise<ProfileVersion> {
      return db.transaction().execute(async (trx) => {
        const row = await findVersionById(trx, id);
        if (!row) throw versionNotFound(id);
        if (row.status !== 'draft') throw frozen(row);
        const profile = (await findProfileById(trx, row.profile_id))!;
        const before = JSON.parse(row.parameters) as ProfileDocument;
        const after = stamped(parameters, profile.document_id, row.version);
        const at = clock.now();
        const updated = await updateDraftParameters(trx, row.id, after, at);
        await recordCatalogueAudit(trx, {
          at,
          actor,
          action: 'profile-version-updated',
          target: `profile-version:${row.id}`,
          before,
          after,
        });
        return toVersion(updated);
      });
    },

    /** Publishes a draft with its changelog line; it is frozen from then on. Throws AppError 409 for a non-draft. */
    publish(actor: User, id: number, changelog: string): Promise<ProfileVersion> {
      return changeStatus(
        actor,
        id,
        (row) =>
          row.status === 'draft'
            ? null
            : new AppError(
                'profile-version-not-draft',
                409,
                `Version ${row.version} is already ${row.status}.`,
              ),
        'profile-version-published',
        (at) => ({
          status: 'published',
          changelog,
          published_at: at,
          published_by: actor.id,
          updated_at: at,
        }),
      );
    },

    /** Retires a published version; it stays readable. Throws AppError 409 for a version not published. */
    retire(actor: User, id: number): Promise<ProfileVersion> {
      return changeStatus(
        actor,
        id,
        (row) =>
          row.status === 'published'
            ? null
            : new AppError(
                'profile-version-not-published',
                409,
                `Only a published version can be retired; version ${row.version} is ${row.status}.`,
              ),
        'profile-version-retired',
        (at) => ({ status: 'retired', retired_at: at, updated_at: at }),
      );
    },

    /** A version with its parameters. Throws AppError 404 for an unknown version. */
    async version(id: number): Promise<ProfileVersion> {
      return toVersion(await loadVersion(id));
    },

    /** The parameter-by-parameter changes from version a to version b. */
    async diff(a: number, b: number): Promise<ProfileDiff> {
      const [from, to] = [await loadVersion(a), await loadVersion(b)];
      return { from: from.id, to: to.id, changes: diffDocuments(parametersOf(from), parametersOf(to)) };
    },

    /** A version's profile document with the file name it downloads as. */
    async exportDocument(id: number): Promise<{ fileName: string; document: ProfileDocument }> {
      const row = await loadVersion(id);
      const document = JSON.parse(row.parameters) as ProfileDocument;
      return { fileName: `profile-${document.id}-v${row.version}.json`, document };
    },
  };
}

export type ProfilesService = ReturnType<typeof createProfilesService>;
