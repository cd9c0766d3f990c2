import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { hashLinkToken, newLinkToken } from '../signup/link-token';
import type { DownloadTokenRow } from './download-tokens-table';

/**
 * Makes a download link's token for an order and stores its hash; the token itself is returned once, never kept.
 *
 * @example
 * const { token, expiresAt } = await insertDownloadToken(trx, { orderId, by: user.id, at, validMs });
 */
export async function insertDownloadToken(
  db: Kysely<Database>,
  input: { orderId: number; by: number | null; at: Date; validMs: number },
): Promise<{ token: string; expiresAt: string }> {
  const { token, hash } = newLinkToken();
  const expiresAt = new Date(input.at.getTime() + input.validMs).toISOString();
  await db
    .insertInto('download_tokens')
    .values({
      order_id: input.orderId,
      token_hash: hash,
      expires_at: expiresAt,
      created_by: input.by,
      created_at: input.at.toISOString(),
    })
    .execute();
  return { token, expiresAt };
}

/** The stored link a token belongs to, looked up by the token's hash. */
export function findDownloadToken(
  db: Kysely<Database>,
  token: string,
): Promise<DownloadTokenRow | undefined> {
  return db
    .selectFrom('download_tokens')
    .selectAll()
    .where('token_hash', '=', hashLinkToken(token))
    .executeTakeFirst();
}
