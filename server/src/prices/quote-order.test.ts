import type { PriceList } from '@clearbase/contracts';
import { describe, expect, it } from 'vitest';
import { formatMoney } from './format-money';
import { QuoteError, quoteOrder } from './quote-order';

const list: PriceList = {
  currency: 'EUR',
  develop: [
    { format: '135-36', process: 'C-41', amountMinor: 1200 },
    { format: '120', process: 'C-41', amountMinor: 1350 },
  ],
  scan: [
    { size: 'standard', amountMinor: 800 },
    { size: 'large', amountMinor: 1500 },
  ],
  pushPullPerStopMinor: 300,
  returnByPostMinor: 450,
};

describe('quoteOrder', () => {
  it('charges developing and scanning per roll', () => {
    const quote = quoteOrder(list, {
      scanSize: 'standard',
      negatives: 'collect',
      rolls: [
        { format: '135-36', process: 'C-41', pushPull: 0 },
        { format: '120', process: 'C-41', pushPull: 0 },
      ],
    });
    expect(quote.currency).toBe('EUR');
    expect(quote.lines.map((l) => [l.rollIndex, l.kind, l.amountMinor])).toEqual([
      [0, 'develop', 1200],
      [0, 'scan', 800],
      [1, 'develop', 1350],
      [1, 'scan', 800],
    ]);
    expect(quote.totalMinor).toBe(4150);
  });

  it('adds the per-stop surcharge for pushed and pulled rolls alike, half stops rounded half up', () => {
    const quote = quoteOrder(
      { ...list, pushPullPerStopMinor: 125 },
      {
        scanSize: 'large',
        negatives: 'collect',
        rolls: [
          { format: '135-36', process: 'C-41', pushPull: 2 },
          { format: '135-36', process: 'C-41', pushPull: -1 },
          { format: '135-36', process: 'C-41', pushPull: 0.5 },
        ],
      },
    );
    const surcharges = quote.lines.filter((l) => l.kind === 'push-pull');
    expect(surcharges.map((l) => [l.label, l.amountMinor])).toEqual([
      ['push 2 stops', 250],
      ['pull 1 stop', 125],
      ['push 0.5 stops', 63],
    ]);
    expect(quote.totalMinor).toBe(3 * (1200 + 1500) + 250 + 125 + 63);
  });

  it('charges posting the negatives back once per order, and nothing when they are collected or post is free', () => {
    const rolls = [
      { format: '135-36', process: 'C-41' as const, pushPull: 0 },
      { format: '120', process: 'C-41' as const, pushPull: 0 },
    ];
    const posted = quoteOrder(list, { scanSize: 'standard', negatives: 'post', rolls });
    expect(posted.lines.filter((l) => l.kind === 'return-by-post')).toEqual([
      { rollIndex: null, kind: 'return-by-post', label: 'Negatives posted back', amountMinor: 450 },
    ]);
    expect(posted.totalMinor).toBe(4150 + 450);
    const collected = quoteOrder(list, { scanSize: 'standard', negatives: 'collect', rolls });
    expect(collected.totalMinor).toBe(4150);
    const free = quoteOrder(
      { ...list, returnByPostMinor: 0 },
      { scanSize: 'standard', negatives: 'post', rolls },
    );
    expect(free.lines.some((l) => l.kind === 'return-by-post')).toBe(false);
  });

  it('names every format, process and scan size the list does not price', () => {
    const draft = {
      scanSize: 'full' as const,
      negatives: 'collect' as const,
      rolls: [
        { format: '135-24', process: 'C-41' as const, pushPull: 0 },
        { format: '120', process: 'E-6' as const, pushPull: 0 },
      ],
    };
    expect(() => quoteOrder(list, draft)).toThrow(QuoteError);
    try {
      quoteOrder(list, draft);
    } catch (err) {
      expect((err as QuoteError).missing).toEqual(['scan size full', '135-24 C-41', '120 E-6']);
    }
  });

  it('gives the same quote for the same inputs, in whole minor units only', () => {
    const draft = {
      scanSize: 'standard' as const,
      negatives: 'post' as const,
      rolls: [{ format: '120', process: 'C-41' as const, pushPull: 1.5 }],
    };
    const a = quoteOrder(list, draft);
    expect(quoteOrder(list, draft)).toEqual(a);
    for (const line of a.lines) expect(Number.isInteger(line.amountMinor)).toBe(true);
  });
});

describe('formatMoney', () => {
  it('uses the decimals ISO 4217 gives each currency', () => {
    expect(formatMoney(2350, 'EUR')).toBe('€23.50');
    expect(formatMoney(1200, 'JPY')).toBe('JP¥1,200');
    expect(formatMoney(1234, 'KWD')).toMatch(/1\.234/);
  });
});
