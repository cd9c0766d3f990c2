import type { CreateStockRequest } from '@clearbase/contracts';

/** An invented unmasked stock on a tinted polyester base, as a manager would create it through the API. */
export const tintedTestStock = {
  name: 'Glasswing 400',
  maker: 'Harrowgate Emulsions',
  iso: 400,
  process: 'C-41',
  masked: false,
  baseMaterial: 'tinted polyester',
  frameFormats: ['135-36'],
} satisfies Partial<CreateStockRequest>;
