import type { ColumnType, Generated, Selectable } from 'kysely';

/** A signed link to an order's finished scans. Only the SHA-256 of its token is kept; it works until it expires. */
export interface DownloadTokensTable {
  id: Generated<number>;
  order_id: number;
  /** SHA-256 (hex) of the token in the link. */
  token_hash: string;
  expires_at: string;
  created_by: number | null;
  created_at: ColumnType<string, string, never>;
}

export type DownloadTokenRow = Selectable<DownloadTokensTable>;
