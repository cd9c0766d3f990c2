import {
  createDraftRequestSchema,
  createProfileRequestSchema,
  publishVersionRequestSchema,
  staffRoles,
  updateDraftRequestSchema,
} from '@clearbase/contracts';
import { z } from 'zod';
import { AppError } from '../errors/app-error';
import type { RouteModule } from '../http/route-module';
import { profileUpload } from './profile-upload';
import { createProfilesService } from './profiles-service';

const operatorRoles = ['operator', 'manager', 'admin'] as const;
const managerRoles = ['manager', 'admin'] as const;
const positiveId = (what: string) => z.coerce.number().int().positive(`Expected a positive ${what} id`);
const idParams = z.object({ id: positiveId('version') });
const profileIdParams = z.object({ id: positiveId('profile') });
const diffParams = z.object({ a: positiveId('version'), b: positiveId('version') });

/** Stock profiles and their versions: create, import, draft, change, publish, retire, compare and export. */
export const profilesRoutes: RouteModule = (api, { db, clock }) => {
  const profiles = createProfilesService({ db, clock });

  api.define(
    {
      method: 'post',
      path: '/api/profiles',
      roles: operatorRoles,
      body: createProfileRequestSchema,
      summary: 'Create a profile and its version 1 draft',
    },
    async (_req, res, { body, user }) => {
      res.status(201).json(await profiles.create(user!, body));
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
      res.status(201).json(await profiles.importDocument(user!, json));
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
      res.status(201).json({ version: await profiles.draftFrom(user!, params.id, body.parentVersionId) });
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
      res.json({ version: await profiles.version(params.id) });
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
      res.json({ version: await profiles.updateDraft(user!, params.id, body.parameters) });
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
      res.json({ version: await profiles.publish(user!, params.id, body.changelog) });
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
      res.json({ version: await profiles.retire(user!, params.id) });
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
      res.json(await profiles.diff(params.a, params.b));
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
      const { fileName, document } = await profiles.exportDocument(params.id);
      res.attachment(fileName);
      res.type('application/json').send(JSON.stringify(document, null, 2));
    },
  );
};
