import { describe, expect, it } from 'vitest';
import { createOrderRequestSchema } from './order';
import { frameBaseRequestSchema } from './frame';
import { adjustmentsSchema, createRollRequestSchema, rollBaseRequestSchema } from './roll';

describe('order contracts', () => {
  it('gives a new order one JPEG at the standard size, negatives kept for collection, unless asked otherwise', () => {
    expect(createOrderRequestSchema.parse({})).toEqual({
      notes: '',
      outputFormats: ['jpeg'],
      scanSize: 'standard',
      negatives: { method: 'collect' },
      rolls: [],
    });
  });

  it('needs a postal address to post the negatives back, and none to collect them', () => {
    const address = { name: 'Ada Fenn', line1: '4 Quay Row', town: 'Harlow Cross', country: 'Nowhere' };
    expect(createOrderRequestSchema.parse({ negatives: { method: 'post', address } }).negatives).toEqual({
      method: 'post',
      address: { ...address, line2: '', postcode: '' },
    });
    const none = createOrderRequestSchema.safeParse({ negatives: { method: 'post' } });
    expect(none.error?.issues[0]?.path).toEqual(['negatives', 'address']);
    const blank = createOrderRequestSchema.safeParse({
      negatives: { method: 'post', address: { ...address, town: '  ' } },
    });
    expect(blank.error?.issues.map((i) => [i.path.join('.'), i.message])).toEqual([
      ['negatives.address.town', 'Give the town or city'],
    ]);
    expect(createOrderRequestSchema.safeParse({ negatives: { method: 'collect', address } }).success).toBe(
      false,
    );
  });

  it('checks every roll sent with an order and names the roll a complaint is about', () => {
    const roll = { stockId: 1, ei: 400, format: '135-36' };
    const result = createOrderRequestSchema.safeParse({ rolls: [roll, { ...roll, ei: 0 }] });
    expect(result.error?.issues.map((i) => i.path.join('.'))).toEqual(['rolls.1.ei']);
    expect(createOrderRequestSchema.parse({ rolls: [roll] }).rolls).toEqual([
      { ...roll, pushPull: 0, scannerId: null },
    ]);
  });

  it('refuses a format listed twice', () => {
    const result = createOrderRequestSchema.safeParse({ outputFormats: ['jpeg', 'jpeg'] });
    expect(result.success).toBe(false);
    expect(result.error?.issues[0]?.message).toBe('List each format once');
  });

  it('takes push and pull in half stops only', () => {
    const roll = { stockId: 1, ei: 800, format: '135-36' };
    expect(createRollRequestSchema.parse({ ...roll, pushPull: 1.5 }).pushPull).toBe(1.5);
    expect(createRollRequestSchema.safeParse({ ...roll, pushPull: 0.3 }).success).toBe(false);
    expect(createRollRequestSchema.parse(roll)).toMatchObject({ pushPull: 0, scannerId: null });
  });

  it('fills neutral adjustments', () => {
    expect(adjustmentsSchema.parse({})).toEqual({
      balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
      exposureStops: 0,
      contrast: null,
      blackPointStops: 0,
      whitePointStops: 0,
    });
  });

  it('needs a frame and a rectangle for a roll base drawn by hand, a rectangle only for a frame', () => {
    const region = { x: 0, y: 0, width: 10, height: 4 };
    expect(rollBaseRequestSchema.safeParse({ mode: 'region', region }).success).toBe(false);
    expect(rollBaseRequestSchema.safeParse({ mode: 'region', frameId: 3, region }).success).toBe(true);
    expect(frameBaseRequestSchema.safeParse({ mode: 'region', region }).success).toBe(true);
    expect(
      frameBaseRequestSchema.safeParse({ mode: 'region', region: { ...region, width: 0 } }).success,
    ).toBe(false);
  });
});
