import { z } from 'zod';
import { profileDocumentSchema } from './profile-document';
import { stockSchema } from '../stocks/stock';

/** Where a version stands: drafts change, published versions are frozen, retired ones stay readable. */
export const profileVersionStatuses = ['draft', 'published', 'retired'] as const;
export const profileVersionStatusSchema = z.enum(profileVersionStatuses);
export type ProfileVersionStatus = z.infer<typeof profileVersionStatusSchema>;

/** A version without its parameters, as lists show it. */
export const profileVersionSummarySchema = z.object({
  id: z.number().int().positive(),
  profileId: z.number().int().positive(),
  version: z.number().int().positive(),
  status: profileVersionStatusSchema,
  parentVersionId: z.number().int().positive().nullable(),
  changelog: z.string().nullable(),
  createdAt: z.string(),
  createdBy: z.number().int().nullable(),
  updatedAt: z.string(),
  publishedAt: z.string().nullable(),
  publishedBy: z.number().int().nullable(),
  retiredAt: z.string().nullable(),
  /** Names of who made and who published the version, where the answer includes them (a stock's page does). */
  createdByName: z.string().nullable().optional(),
  publishedByName: z.string().nullable().optional(),
});
export type ProfileVersionSummary = z.infer<typeof profileVersionSummarySchema>;

/** A version with its parameters (the profile document). */
export const profileVersionSchema = profileVersionSummarySchema.extend({ parameters: profileDocumentSchema });
export type ProfileVersion = z.infer<typeof profileVersionSchema>;

/** A stock profile, optionally for one scanner. */
export const profileSchema = z.object({
  id: z.number().int().positive(),
  stockId: z.number().int().positive(),
  scannerId: z.number().int().positive().nullable(),
  name: z.string(),
  documentId: z.string(),
  createdAt: z.string(),
});
export type Profile = z.infer<typeof profileSchema>;

/** A stock's page: the stock, its profiles and each profile's versions, oldest first. */
export const stockDetailSchema = z.object({
  stock: stockSchema,
  profiles: z.array(profileSchema.extend({ versions: z.array(profileVersionSummarySchema) })),
});
export type StockDetail = z.infer<typeof stockDetailSchema>;

const positiveId = z.int('Expected a whole id').positive('Expected a positive id');

/** Creates a profile and its version 1 draft; without parameters the draft starts from neutral defaults. */
export const createProfileRequestSchema = z.strictObject({
  stockId: positiveId,
  scannerId: positiveId.nullable().default(null),
  name: z.string().trim().min(1, 'Enter the profile’s name').max(120),
  parameters: profileDocumentSchema.optional(),
});
export type CreateProfileRequest = z.infer<typeof createProfileRequestSchema>;

/** Makes a new draft from any version of the same profile. */
export const createDraftRequestSchema = z.strictObject({ parentVersionId: positiveId });
export type CreateDraftRequest = z.infer<typeof createDraftRequestSchema>;

/** Replaces a draft's parameters. */
export const updateDraftRequestSchema = z.strictObject({ parameters: profileDocumentSchema });
export type UpdateDraftRequest = z.infer<typeof updateDraftRequestSchema>;

/** Publishing needs one line saying what changed. */
export const publishVersionRequestSchema = z.strictObject({
  changelog: z.string().trim().min(1, 'Say in one line what changed').max(500),
});
export type PublishVersionRequest = z.infer<typeof publishVersionRequestSchema>;

/** One parameter that differs between two versions; paths look like 'curves.red.points[2].density'. */
export const parameterChangeSchema = z.object({ path: z.string(), before: z.unknown(), after: z.unknown() });
export type ParameterChange = z.infer<typeof parameterChangeSchema>;

export const profileDiffSchema = z.object({
  from: z.number().int().positive(),
  to: z.number().int().positive(),
  changes: z.array(parameterChangeSchema),
});
export type ProfileDiff = z.infer<typeof profileDiffSchema>;

/** What an import made: a new profile with its version 1 draft, or a new draft of the profile the document names. */
export const importProfileResponseSchema = z.object({
  created: z.enum(['profile', 'draft']),
  profile: profileSchema,
  version: profileVersionSchema,
});
export type ImportProfileResponse = z.infer<typeof importProfileResponseSchema>;
