import type { OrderStatus } from '@clearbase/contracts';
import type { ColumnType, Generated, Selectable } from 'kysely';

/** A customer's order. */
export interface OrdersTable {
  id: Generated<number>;
  customer_id: number;
  status: OrderStatus;
  notes: ColumnType<string, string | undefined, string>;
  /** JSON array of output formats */
  output_formats: string;
  scan_size: string;
  /** JSON: what happens to the negatives, posted back to an address or collected at the lab */
  negatives: ColumnType<string, string | undefined, string>;
  /** JSON: the price list the order was placed under; null on orders placed before orders kept one */
  price_list: ColumnType<string | null, string | null | undefined, string | null>;
  created_at: ColumnType<string, string, never>;
  updated_at: string;
}

export type OrderRow = Selectable<OrdersTable>;
