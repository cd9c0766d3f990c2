import type { ColumnType, Generated, Selectable } from 'kysely';

/** What the outbox is doing with a message: waiting (first try or retry), handed over, or given up. */
export type OutboxState = 'pending' | 'sent' | 'failed';

/** One e-mail waiting for, or past, delivery. Rows are written in the transaction of the change they tell of. */
export interface OutboxTable {
  id: Generated<number>;
  to_address: string;
  subject: string;
  text_body: string;
  html_body: string;
  /** Which template made it, e.g. `verify-email`. */
  kind: string;
  state: ColumnType<OutboxState, OutboxState | undefined, OutboxState>;
  attempts: ColumnType<number, number | undefined, number>;
  next_attempt_at: string;
  last_error: string | null;
  created_at: ColumnType<string, string, never>;
  sent_at: string | null;
}

export type OutboxRow = Selectable<OutboxTable>;
