import type { Profile, ProfileDocument, ProfileVersion, ProfileVersionSummary } from '@clearbase/contracts';
import type { Kysely, Updateable } from 'kysely';
import type { Database, ProfileRow, ProfileVersionRow } from '../db/database';
import { AppError } from '../errors/app-error';

// The RAISE messages of the triggers that guard versions (migrations ..._freeze_published_profile_versions,
// ..._forbid_reopening_profile_versions, ..._freeze_published_changelog).
const frozenVersionMessages = [
  'published profile versions are immutable',
  'profile versions move only from draft to published to retired',
];

/**
 * True when SQLite refused a change to a profile version because one of the version triggers raised: the row was
 * published or retired by someone else between our read and our write.
 */
export function isFrozenVersionViolation(err: unknown): boolean {
  if (typeof err !== 'object' || err === null) return false;
  const { code, message } = err as { code?: unknown; message?: unknown };
  return (
    code === 'SQLITE_CONSTRAINT_TRIGGER' &&
    typeof message === 'string' &&
    frozenVersionMessages.some((m) => message.includes(m))
  );
}

/** Runs a write on a version; a trigger's refusal becomes the 409 problem the API promises. */
async function guardFrozen<T>(versionId: number, write: () => Promise<T>): Promise<T> {
  try {
    return await write();
  } catch (err) {
    if (isFrozenVersionViolation(err)) {
      throw new AppError(
        'profile-version-immutable',
        409,
        `Profile version ${versionId} was published or retired meanwhile and cannot change; reload it and make a new draft from it instead.`,
      );
    }
    throw err;
  }
}

export function findProfileById(db: Kysely<Database>, id: number): Promise<ProfileRow | undefined> {
  return db.selectFrom('profiles').selectAll().where('id', '=', id).executeTakeFirst();
}

export function findProfileByDocumentId(
  db: Kysely<Database>,
  documentId: string,
): Promise<ProfileRow | undefined> {
  return db.selectFrom('profiles').selectAll().where('document_id', '=', documentId).executeTakeFirst();
}

export function listProfilesOfStock(db: Kysely<Database>, stockId: number): Promise<ProfileRow[]> {
  return db.selectFrom('profiles').selectAll().where('stock_id', '=', stockId).orderBy('id').execute();
}

export function listVersionsOfProfiles(
  db: Kysely<Database>,
  profileIds: readonly number[],
): Promise<ProfileVersionRow[]> {
  if (profileIds.length === 0) return Promise.resolve([]);
  return db
    .selectFrom('profile_versions')
    .selectAll()
    .where('profile_id', 'in', profileIds)
    .orderBy('profile_id')
    .orderBy('version')
    .execute();
}

/** The names of the given users by id, for saying who made and published versions; unknown ids are left out. */
export async function userNamesById(
  db: Kysely<Database>,
  ids: readonly (number | null)[],
): Promise<Map<number, string>> {
  const wanted = [...new Set(ids.filter((id): id is number => id !== null))];
  if (wanted.length === 0) return new Map();
  const rows = await db.selectFrom('users').select(['id', 'name']).where('id', 'in', wanted).execute();
  return new Map(rows.map((r) => [r.id, r.name]));
}

export function findVersionById(db: Kysely<Database>, id: number): Promise<ProfileVersionRow | undefined> {
  return db.selectFrom('profile_versions').selectAll().where('id', '=', id).executeTakeFirst();
}

/** The version with the given number of a profile, if it has one. */
export function findVersionOfProfile(
  db: Kysely<Database>,
  profileId: number,
  version: number,
): Promise<ProfileVersionRow | undefined> {
  return db
    .selectFrom('profile_versions')
    .selectAll()
    .where('profile_id', '=', profileId)
    .where('version', '=', version)
    .executeTakeFirst();
}

/**
 * Replaces a draft's parameters. Throws AppError 409 (profile-version-immutable) when the database refuses because
 * the version is no longer a draft.
 */
export function updateDraftParameters(
  db: Kysely<Database>,
  id: number,
  parameters: ProfileDocument,
  at: Date,
): Promise<ProfileVersionRow> {
  return guardFrozen(id, () =>
    db
      .updateTable('profile_versions')
      .set({ parameters: JSON.stringify(parameters), updated_at: at.toISOString() })
      .where('id', '=', id)
      .returningAll()
      .executeTakeFirstOrThrow(),
  );
}

/**
 * Moves a version to a new status with the columns that go with it (changelog, who and when). Throws AppError 409
 * (profile-version-immutable) when the database refuses the move.
 */
export function updateVersionStatus(
  db: Kysely<Database>,
  id: number,
  set: Updateable<Database['profile_versions']>,
): Promise<ProfileVersionRow> {
  return guardFrozen(id, () =>
    db.updateTable('profile_versions').set(set).where('id', '=', id).returningAll().executeTakeFirstOrThrow(),
  );
}

export async function nextVersionNumber(db: Kysely<Database>, profileId: number): Promise<number> {
  const { top } = await db
    .selectFrom('profile_versions')
    .select((eb) => eb.fn.max('version').as('top'))
    .where('profile_id', '=', profileId)
    .executeTakeFirstOrThrow();
  return Number(top ?? 0) + 1;
}

export function insertProfile(
  db: Kysely<Database>,
  row: {
    stockId: number;
    scannerId: number | null;
    name: string;
    documentId: string;
    at: Date;
    by: number | null;
  },
): Promise<ProfileRow> {
  return db
    .insertInto('profiles')
    .values({
      stock_id: row.stockId,
      scanner_id: row.scannerId,
      name: row.name,
      document_id: row.documentId,
      created_at: row.at.toISOString(),
      created_by: row.by,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

/** Adds a draft numbered max+1; the stored document carries the profile's document id and the version number. */
export async function insertDraft(
  db: Kysely<Database>,
  draft: {
    profile: ProfileRow;
    parentVersionId: number | null;
    parameters: ProfileDocument;
    at: Date;
    by: number | null;
  },
): Promise<ProfileVersionRow> {
  const version = await nextVersionNumber(db, draft.profile.id);
  const at = draft.at.toISOString();
  return db
    .insertInto('profile_versions')
    .values({
      profile_id: draft.profile.id,
      version,
      status: 'draft',
      parent_version_id: draft.parentVersionId,
      parameters: JSON.stringify(stamped(draft.parameters, draft.profile.document_id, version)),
      changelog: null,
      created_at: at,
      created_by: draft.by,
      updated_at: at,
      published_at: null,
      published_by: null,
      retired_at: null,
    })
    .returningAll()
    .executeTakeFirstOrThrow();
}

/** A document labelled with the profile and version it belongs to. */
export function stamped(parameters: ProfileDocument, documentId: string, version: number): ProfileDocument {
  return { ...parameters, id: documentId, version };
}

export function toProfile(row: ProfileRow): Profile {
  return {
    id: row.id,
    stockId: row.stock_id,
    scannerId: row.scanner_id,
    name: row.name,
    documentId: row.document_id,
    createdAt: row.created_at,
  };
}

export function toVersionSummary(row: ProfileVersionRow): ProfileVersionSummary {
  return {
    id: row.id,
    profileId: row.profile_id,
    version: row.version,
    status: row.status,
    parentVersionId: row.parent_version_id,
    changelog: row.changelog,
    createdAt: row.created_at,
    createdBy: row.created_by,
    updatedAt: row.updated_at,
    publishedAt: row.published_at,
    publishedBy: row.published_by,
    retiredAt: row.retired_at,
  };
}

export function toVersion(row: ProfileVersionRow): ProfileVersion {
  return { ...toVersionSummary(row), parameters: JSON.parse(row.parameters) as ProfileDocument };
}
