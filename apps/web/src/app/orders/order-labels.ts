import type {
  NegativesReturn,
  OrderStatus,
  OutputFormat,
  PostalAddress,
  Role,
  ScanSize,
} from '@clearbase/contracts';

const statusLabels: Record<OrderStatus, string> = {
  received: 'Received',
  developing: 'Developing',
  scanning: 'Scanning',
  tuning: 'Tuning',
  ready: 'Ready',
  delivered: 'Delivered',
  cancelled: 'Cancelled',
};

const formatLabels: Record<OutputFormat, string> = {
  jpeg: 'JPEG (8-bit)',
  tiff16: 'TIFF (16-bit)',
  png16: 'PNG (16-bit)',
};

const scanSizeLabels: Record<ScanSize, string> = {
  standard: 'Standard (3000 px long edge)',
  large: 'Large (6000 px long edge)',
  full: 'Full (as scanned)',
};

export const orderStatusLabel = (s: OrderStatus) => statusLabels[s];
export const outputFormatLabel = (f: OutputFormat) => formatLabels[f];
export const scanSizeLabel = (s: ScanSize) => scanSizeLabels[s];

/** The way an order goes, in order; cancelled is off the way. */
export const orderSteps: readonly OrderStatus[] = [
  'received',
  'developing',
  'scanning',
  'tuning',
  'ready',
  'delivered',
];

/** Every status a list may be filtered by. */
export const orderStatusChoices: readonly OrderStatus[] = [...orderSteps, 'cancelled'];

/** One step of an order's timeline. */
export interface OrderStep {
  status: OrderStatus;
  label: string;
  state: 'passed' | 'current' | 'ahead';
}

/**
 * The steps of an order's way, each passed, current or still ahead. A cancelled order shows the way it had not
 * finished, all ahead, and the caller says it was cancelled.
 *
 * @example
 * orderTimeline('scanning').map((s) => s.state) // ['passed', 'passed', 'current', 'ahead', 'ahead', 'ahead']
 */
export function orderTimeline(status: OrderStatus): OrderStep[] {
  const at = orderSteps.indexOf(status);
  return orderSteps.map((s, i) => ({
    status: s,
    label: statusLabels[s],
    state: at < 0 ? 'ahead' : i < at ? 'passed' : i === at ? 'current' : 'ahead',
  }));
}

/** The status after this one on the way, or null at its end (and for a closed order). */
export function nextOrderStatus(status: OrderStatus): OrderStatus | null {
  if (status === 'cancelled') return null;
  return orderSteps[orderSteps.indexOf(status) + 1] ?? null;
}

/** Delivered and cancelled orders stay as they are. */
export const orderClosed = (status: OrderStatus) => status === 'delivered' || status === 'cancelled';

/** Lab staff, who see every order and work on it. */
export const isStaffRole = (role: Role | null) =>
  role === 'operator' || role === 'manager' || role === 'admin';

/**
 * The columns of the order list for a role: staff see whose order it is; a customer, whose every order is their
 * own, sees what they asked for instead.
 */
export function orderColumns(role: Role | null): string[] {
  return isStaffRole(role)
    ? ['id', 'customer', 'status', 'rolls', 'created']
    : ['id', 'status', 'rolls', 'outputs', 'created'];
}

/** The chip colour of an order status. */
export function orderStatusTone(status: OrderStatus): string {
  if (status === 'ready' || status === 'delivered') return 'good';
  if (status === 'cancelled') return 'bad';
  if (status === 'received') return '';
  return 'working';
}

/** A postal address on one line, its empty parts left out: "7 Saltmarsh Lane, Greywick GW2 9RT, Testland". */
export function postalAddressLine(address: PostalAddress): string {
  const town = [address.town, address.postcode].filter((p) => p.trim()).join(' ');
  return [address.name, address.line1, address.line2, town, address.country]
    .filter((p) => p.trim())
    .join(', ');
}

/** What happens to an order's negatives, in a sentence. */
export function negativesLabel(negatives: NegativesReturn): string {
  return negatives.method === 'post'
    ? `Posted back to ${postalAddressLine(negatives.address)}`
    : 'Kept at the lab to be collected';
}

/**
 * Frame formats offered as suggestions when ordering; any other format can be typed. 135 in 36, 24 and 12
 * exposures, 120, 220, 127 and 110 roll film, 4×5 in sheets: common practice of the trade, from memory.
 */
export const commonFrameFormats: readonly string[] = [
  '135-36',
  '135-24',
  '135-12',
  '120',
  '220',
  '127',
  '110',
  '4x5 sheet',
];
