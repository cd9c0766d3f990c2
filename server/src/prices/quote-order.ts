import type { OrderDraft, PriceList, Quote, QuoteLine } from '@clearbase/contracts';

/** Thrown when the price list has no price for something the order asks for; `missing` names each gap. */
export class QuoteError extends Error {
  override readonly name = 'QuoteError';
  constructor(readonly missing: readonly string[]) {
    super(`The price list has no price for ${missing.join(', ')}.`);
  }
}

function stopsLabel(pushPull: number): string {
  const n = Math.abs(pushPull);
  return `${pushPull > 0 ? 'push' : 'pull'} ${n} stop${n === 1 ? '' : 's'}`;
}

/**
 * Prices an order from the price list: per roll, developing (by format and process), scanning (by the order's scan
 * size) and, for a pushed or pulled roll, the per-stop surcharge times the stops, rounded half up to a whole minor
 * unit; then, once per order, posting the negatives back when the customer asks for it and the lab charges for it.
 * Pure: the same list and draft always give the same quote.
 *
 * Throws QuoteError naming every format/process or scan size the list does not price.
 *
 * @example
 * quoteOrder(list, { scanSize: 'standard', rolls: [{ format: '135-36', process: 'C-41', pushPull: 1 }] });
 * // { currency: 'EUR', totalMinor: 2300, lines: [develop 1200, scan 800, push 1 stop 300] }
 */
export function quoteOrder(priceList: PriceList, draft: OrderDraft): Quote {
  const lines: QuoteLine[] = [];
  const missing = new Set<string>();
  const scan = priceList.scan.find((s) => s.size === draft.scanSize);
  if (!scan) missing.add(`scan size ${draft.scanSize}`);
  draft.rolls.forEach((roll, rollIndex) => {
    const develop = priceList.develop.find((d) => d.format === roll.format && d.process === roll.process);
    if (!develop) {
      missing.add(`${roll.format} ${roll.process}`);
    } else {
      lines.push({
        rollIndex,
        kind: 'develop',
        label: `Develop ${roll.format} ${roll.process}`,
        amountMinor: develop.amountMinor,
      });
    }
    if (scan) {
      lines.push({ rollIndex, kind: 'scan', label: `Scan, ${scan.size}`, amountMinor: scan.amountMinor });
    }
    if (roll.pushPull !== 0) {
      lines.push({
        rollIndex,
        kind: 'push-pull',
        label: stopsLabel(roll.pushPull),
        amountMinor: Math.round(Math.abs(roll.pushPull) * priceList.pushPullPerStopMinor),
      });
    }
  });
  if (draft.negatives === 'post' && priceList.returnByPostMinor > 0) {
    lines.push({
      rollIndex: null,
      kind: 'return-by-post',
      label: 'Negatives posted back',
      amountMinor: priceList.returnByPostMinor,
    });
  }
  if (missing.size) throw new QuoteError([...missing]);
  return {
    currency: priceList.currency,
    lines,
    totalMinor: lines.reduce((sum, line) => sum + line.amountMinor, 0),
  };
}
