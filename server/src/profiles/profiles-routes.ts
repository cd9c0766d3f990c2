import {
  createDraftRequestSchema,
  createProfileRequestSchema,
  publishVersionRequestSchema,
  staffRoles,
  updateDraftRequestSchema,
  validateProfileDocument,
  type ProfileDiff,
  type ProfileDocument,
  type User,
} from '@clearbase/contracts';
import { randomUUID } from 'node:crypto';
import { z } from 'zod';
import type { Kysely, Updateable } from 'kysely';
import type { Database, ProfileVersionRow } from '../db/database';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { findScannerById } from '../scanners/scanner-repository';
import { findStockById, findStockByName } from '../stocks/stock-repository';
import { defaultProfileDocument } from './default-profile-document';
import { diffDocuments } from './diff-documents';
import { profileUpload } from './profile-upload';
import {
  findProfileByDocumentId,
  findProfileById,
  findVersionById,
  findVersionOfProfile,
  insertDraft,
  insertProfile,
  stamped,
  toProfile,
  toVersion,
  toVersionSummary,
  updateDraftParameters,
  updateVersionStatus,
} from './profile-repository';
import { recordCatalogueAudit } from './record-catalogue-audit';

const operatorRoles = ['operator', 'manager', 'admin'] as const;
const managerRoles = ['manager', 'admin'] as const;
const positiveId = (what: string) => z.coerce.number().int().positive(`Expected a positive ${what} id`);
const idParams = z.object({ id: positiveId('version') });
const profileIdParams = z.object({ id: positiveId('profile') });
const diffParams = z.object({ a: positiveId('version'), b: positiveId('version') });

/** Moves a version on to its next status and audits the change with the summaries before and after. */
async function changeVersionStatus(
  trx: Kysely<Database>,
  row: ProfileVersionRow,
  action: 'profile-version-published' | 'profile-version-retired',
  actor: User,
  at: Date,
  set: Updateable<Database['profile_versions']>,
) {
  const updated = await updateVersionStatus(trx, row.id, set);
  await recordCatalogueAudit(trx, {
    at,
    actor,
    action,
    target: `profile-version:${row.id}`,
    before: toVersionSummary(row),
    after: toVersionSummary(updated),
  });
  return toVersion(updated);
}

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

export const profilesRoutes: RouteModule = (api, { db, clock }) => {
  const loadVersion = async (id: number) => {
    const row = await findVersionById(db, id);
    if (!row) throw versionNotFound(id);
    return row;
  };

  api.define(
    {
      method: 'post',
      path: '/api/profiles',
      roles: operatorRoles,
      body: createProfileRequestSchema,
      summary: 'Create a profile and its version 1 draft',
    },
    async (_req, res, { body, user }) => {
      const stock = await findStockById(db, body.stockId);
      if (!stock) throw new AppError('stock-not-found', 404, `No stock with id ${body.stockId}.`);
      if (body.scannerId !== null && !(await findScannerById(db, body.scannerId))) {
        throw new AppError('scanner-not-found', 404, `No scanner with id ${body.scannerId}.`);
      }
      if (stock.process !== 'C-41') {
        throw new AppError(
          'process-not-supported',
          422,
          `Profiles invert C-41 stocks; ${stock.name} is ${stock.process}.`,
        );
      }
      const documentId = randomUUID();
      const created = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        const profile = await insertProfile(trx, {
          stockId: stock.id,
          scannerId: body.scannerId,
          name: body.name,
          documentId,
          at,
          by: user!.id,
        });
        const draft = await insertDraft(trx, {
          profile,
          parentVersionId: null,
          parameters: body.parameters ?? defaultProfileDocument(stock, documentId),
          at,
          by: user!.id,
        });
        const result = { profile: toProfile(profile), version: toVersion(draft) };
        await recordCatalogueAudit(trx, {
          at,
          actor: user!,
          action: 'profile-created',
          target: `profile:${profile.id}`,
          before: null,
          after: result,
        });
        return result;
      });
      res.status(201).json(created);
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/profiles/import',
      roles: operatorRoles,
      before: [profileUpload],
      summary: 'Import a profile document as a new profile or a new draft',
    },
    async (req, res, { user }) => {
      let json: unknown = req.body;
      if (req.file) {
        try {
          json = JSON.parse(req.file.buffer.toString('utf8'));
        } catch {
          throw new AppError(
            'profile-file-not-json',
            400,
            `The file ${req.file.originalname} is not valid JSON.`,
          );
        }
      }
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
      const result = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        const existing = await findProfileByDocumentId(trx, document.id);
        if (existing) {
          const parent = await findVersionOfProfile(trx, existing.id, document.version);
          const draft = await insertDraft(trx, {
            profile: existing,
            parentVersionId: parent?.id ?? null,
            parameters: document,
            at,
            by: user!.id,
          });
          const made = { created: 'draft' as const, profile: toProfile(existing), version: toVersion(draft) };
          await recordCatalogueAudit(trx, {
            at,
            actor: user!,
            action: 'profile-imported',
            target: `profile-version:${draft.id}`,
            before: null,
            after: made,
          });
          return made;
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
        const profile = await insertProfile(trx, {
          stockId: stock.id,
          scannerId: null,
          name: `${stock.name} (imported)`,
          documentId: document.id,
          at,
          by: user!.id,
        });
        const draft = await insertDraft(trx, {
          profile,
          parentVersionId: null,
          parameters: document,
          at,
          by: user!.id,
        });
        const made = { created: 'profile' as const, profile: toProfile(profile), version: toVersion(draft) };
        await recordCatalogueAudit(trx, {
          at,
          actor: user!,
          action: 'profile-imported',
          target: `profile:${profile.id}`,
          before: null,
          after: made,
        });
        return made;
      });
      res.status(201).json(result);
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/profiles/:id/versions',
      roles: operatorRoles,
      params: profileIdParams,
      body: createDraftRequestSchema,
      summary: 'New draft from any version',
    },
    async (_req, res, { params, body, user }) => {
      const profile = await findProfileById(db, params.id);
      if (!profile) throw new AppError('profile-not-found', 404, `No profile with id ${params.id}.`);
      const parent = await findVersionById(db, body.parentVersionId);
      if (!parent || parent.profile_id !== profile.id) {
        throw new AppError(
          'profile-version-not-found',
          404,
          `Profile ${profile.id} has no version with id ${body.parentVersionId}.`,
        );
      }
      const version = await db.transaction().execute(async (trx) => {
        const at = clock.now();
        const draft = await insertDraft(trx, {
          profile,
          parentVersionId: parent.id,
          parameters: JSON.parse(parent.parameters) as ProfileDocument,
          at,
          by: user!.id,
        });
        await recordCatalogueAudit(trx, {
          at,
          actor: user!,
          action: 'profile-version-created',
          target: `profile-version:${draft.id}`,
          before: null,
          after: toVersionSummary(draft),
        });
        return toVersion(draft);
      });
      res.status(201).json({ version });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/profile-versions/:id',
      roles: staffRoles,
      params: idParams,
      summary: 'A version with its parameters',
    },
    async (_req, res, { params }) => {
      res.json({ version: toVersion(await loadVersion(params.id)) });
    },
  );

  api.define(
    {
      method: 'patch',
      path: '/api/profile-versions/:id',
      roles: operatorRoles,
      params: idParams,
      body: updateDraftRequestSchema,
      summary: 'Change a draft’s parameters',
    },
    async (_req, res, { params, body, user }) => {
      const version = await db.transaction().execute(async (trx) => {
        const row = await findVersionById(trx, params.id);
        if (!row) throw versionNotFound(params.id);
        if (row.status !== 'draft') throw frozen(row);
        const profile = (await findProfileById(trx, row.profile_id))!;
        const before = JSON.parse(row.parameters) as ProfileDocument;
        const after = stamped(body.parameters, profile.document_id, row.version);
        const at = clock.now();
        const updated = await updateDraftParameters(trx, row.id, after, at);
        await recordCatalogueAudit(trx, {
          at,
          actor: user!,
          action: 'profile-version-updated',
          target: `profile-version:${row.id}`,
          before,
          after,
        });
        return toVersion(updated);
      });
      res.json({ version });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/profile-versions/:id/publish',
      roles: managerRoles,
      params: idParams,
      body: publishVersionRequestSchema,
      summary: 'Publish a draft with a changelog line',
    },
    async (_req, res, { params, body, user }) => {
      const version = await db.transaction().execute(async (trx) => {
        const row = await findVersionById(trx, params.id);
        if (!row) throw versionNotFound(params.id);
        if (row.status !== 'draft')
          throw new AppError(
            'profile-version-not-draft',
            409,
            `Version ${row.version} is already ${row.status}.`,
          );
        const at = clock.now().toISOString();
        return changeVersionStatus(trx, row, 'profile-version-published', user!, clock.now(), {
          status: 'published',
          changelog: body.changelog,
          published_at: at,
          published_by: user!.id,
          updated_at: at,
        });
      });
      res.json({ version });
    },
  );

  api.define(
    {
      method: 'post',
      path: '/api/profile-versions/:id/retire',
      roles: managerRoles,
      params: idParams,
      summary: 'Retire a published version (it stays readable)',
    },
    async (_req, res, { params, user }) => {
      const version = await db.transaction().execute(async (trx) => {
        const row = await findVersionById(trx, params.id);
        if (!row) throw versionNotFound(params.id);
        if (row.status !== 'published') {
          throw new AppError(
            'profile-version-not-published',
            409,
            `Only a published version can be retired; version ${row.version} is ${row.status}.`,
          );
        }
        const at = clock.now().toISOString();
        return changeVersionStatus(trx, row, 'profile-version-retired', user!, clock.now(), {
          status: 'retired',
          retired_at: at,
          updated_at: at,
        });
      });
      res.json({ version });
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/profile-versions/:a/diff/:b',
      roles: staffRoles,
      params: diffParams,
      summary: 'Parameter-by-parameter changes from version a to version b',
    },
    async (_req, res, { params }) => {
      const [a, b] = [await loadVersion(params.a), await loadVersion(params.b)];
      // id and version always differ between two versions; they are labels, not parameters
      const parameters = (row: ProfileVersionRow) => {
        const { id: _id, version: _version, ...rest } = JSON.parse(row.parameters) as ProfileDocument;
        return rest;
      };
      const diff: ProfileDiff = {
        from: a.id,
        to: b.id,
        changes: diffDocuments(parameters(a), parameters(b)),
      };
      res.json(diff);
    },
  );

  api.define(
    {
      method: 'get',
      path: '/api/profile-versions/:id/export',
      roles: staffRoles,
      params: idParams,
      summary: 'The version’s profile document as a JSON download',
    },
    async (_req, res, { params }) => {
      const row = await loadVersion(params.id);
      const document = JSON.parse(row.parameters) as ProfileDocument;
      res.attachment(`profile-${document.id}-v${row.version}.json`);
      res.type('application/json').send(JSON.stringify(document, null, 2));
    },
  );
};
