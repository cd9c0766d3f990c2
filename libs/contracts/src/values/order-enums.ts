/** Where an order stands, in the order it moves; cancelled can end it from any open status. */
export const orderStatuses = [
  'received',
  'developing',
  'scanning',
  'tuning',
  'ready',
  'delivered',
  'cancelled',
] as const;
export type OrderStatus = (typeof orderStatuses)[number];

/** Finished file formats a customer can ask for: 8-bit JPEG, 16-bit TIFF, 16-bit PNG. */
export const outputFormats = ['jpeg', 'tiff16', 'png16'] as const;
export type OutputFormat = (typeof outputFormats)[number];

/** Scan sizes on offer, by the long edge of the delivered file. */
export const scanSizes = ['standard', 'large', 'full'] as const;
export type ScanSize = (typeof scanSizes)[number];

/** Where a roll stands, from waiting for its scans to inverted (or needing an operator). */
export const rollStatuses = [
  'awaiting-scans',
  'scanned',
  'inverting',
  'inverted',
  'needs-attention',
] as const;
export type RollStatus = (typeof rollStatuses)[number];
