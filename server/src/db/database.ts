import type { Role } from '@clearbase/contracts';
import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';
import type { CalibrationsTable } from '../calibrations/calibrations-table';
import type { DownloadTokensTable } from '../downloads/download-tokens-table';
import type { FilesTable } from '../files/file-tables';
import type { FrameOutputsTable, FramesTable } from '../frames/frame-tables';
import type { JobsTable } from '../jobs/job-tables';
import type { OrdersTable } from '../orders/order-tables';
import type { RollsTable } from '../rolls/roll-tables';
import type { OutboxTable } from '../mail/outbox-table';
import type { PaymentEventsTable, PaymentRefundsTable, PaymentsTable } from '../payments/payment-tables';
import type { FrameReviewsTable } from '../review/frame-reviews-table';
import type { PasswordTokensTable, PendingSignupsTable } from '../signup/signup-tables';

/** Times are ISO-8601 UTC text; booleans are 0/1 integers (SQLite has no boolean type). */
export interface UsersTable {
  id: Generated<number>;
  email: string;
  name: string;
  role: Role;
  password_hash: string;
  disabled: ColumnType<number, number | undefined, number>;
  created_at: ColumnType<string, string, never>;
  last_sign_in_at: string | null;
  password_changed_at: string | null;
}

export interface SessionsTable {
  sid: string;
  user_id: number | null;
  data: string;
  expires_at: string;
}

export interface AuditLogTable {
  id: Generated<number>;
  at: ColumnType<string, string, never>;
  actor_id: number | null;
  actor_email: string | null;
  action: string;
  target: string | null;
  /** JSON object text */
  details: string | null;
}

/** Lab-wide settings as key/value pairs (value is JSON text). */
export interface SettingsTable {
  key: string;
  value: string;
}

/** A film stock of the catalogue. */
export interface StocksTable {
  id: Generated<number>;
  name: string;
  maker: string;
  iso: number;
  process: string;
  /** 0/1 */
  masked: number;
  base_material: string;
  /** JSON array of frame format names */
  frame_formats: string;
  notes: ColumnType<string, string | undefined, string>;
  /** null: rate at the box speed */
  recommended_ei: ColumnType<number | null, number | null | undefined, number | null>;
  /** null: not stated */
  latitude_under_stops: ColumnType<number | null, number | null | undefined, number | null>;
  latitude_over_stops: ColumnType<number | null, number | null | undefined, number | null>;
  push_pull_notes: ColumnType<string, string | undefined, string>;
  /** p of t_corrected = t_metered^p */
  reciprocity_exponent: ColumnType<number, number | undefined, number>;
  handling_notes: ColumnType<string, string | undefined, string>;
  created_at: ColumnType<string, string, never>;
}

/** An input device with its scanner input profile. */
export interface ScannersTable {
  id: Generated<number>;
  name: string;
  kind: string;
  /** JSON scanner input profile */
  input_profile: string;
  created_at: ColumnType<string, string, never>;
}

/** A stock profile (per stock, optionally per scanner); its parameters live in its versions. */
export interface ProfilesTable {
  id: Generated<number>;
  stock_id: number;
  scanner_id: number | null;
  name: string;
  /** The id its profile documents carry. */
  document_id: string;
  created_at: ColumnType<string, string, never>;
  created_by: number | null;
}

/** A numbered version of a profile: draft, published (immutable, enforced by trigger) or retired. */
export interface ProfileVersionsTable {
  id: Generated<number>;
  profile_id: number;
  version: number;
  status: 'draft' | 'published' | 'retired';
  parent_version_id: number | null;
  /** JSON profile document */
  parameters: string;
  changelog: string | null;
  created_at: ColumnType<string, string, never>;
  created_by: number | null;
  updated_at: string;
  published_at: string | null;
  published_by: number | null;
  retired_at: string | null;
  /** The calibration the draft was fitted from, if any. */
  calibration_id: ColumnType<number | null, number | null | undefined, number | null>;
}

/** The one database schema of Clearbase. */
export interface Database {
  users: UsersTable;
  sessions: SessionsTable;
  audit_log: AuditLogTable;
  settings: SettingsTable;
  stocks: StocksTable;
  scanners: ScannersTable;
  profiles: ProfilesTable;
  profile_versions: ProfileVersionsTable;
  outbox: OutboxTable;
  pending_signups: PendingSignupsTable;
  password_tokens: PasswordTokensTable;
  payments: PaymentsTable;
  payment_events: PaymentEventsTable;
  payment_refunds: PaymentRefundsTable;
  files: FilesTable;
  orders: OrdersTable;
  rolls: RollsTable;
  frames: FramesTable;
  frame_outputs: FrameOutputsTable;
  jobs: JobsTable;
  calibrations: CalibrationsTable;
  frame_reviews: FrameReviewsTable;
  download_tokens: DownloadTokensTable;
}

export type UserRow = Selectable<UsersTable>;
export type NewUserRow = Insertable<UsersTable>;
export type UserRowUpdate = Updateable<UsersTable>;

export type StockRow = Selectable<StocksTable>;
export type ScannerRow = Selectable<ScannersTable>;
export type ProfileRow = Selectable<ProfilesTable>;
export type ProfileVersionRow = Selectable<ProfileVersionsTable>;
