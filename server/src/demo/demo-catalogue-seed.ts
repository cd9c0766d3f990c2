import type { CreateScannerRequest, CreateStockRequest, ProfileDocument } from '@clearbase/contracts';
import type { Kysely } from 'kysely';
import type { Database } from '../db/database';
import { insertScanner } from '../scanners/scanner-repository';
import { insertStock } from '../stocks/stock-repository';
import { baseOf } from '../profiles/default-profile-document';
import { insertDraft, insertProfile } from '../profiles/profile-repository';
import type { SeedStep } from './seed-step';

interface DemoStock {
  stock: CreateStockRequest;
  /** Gamma per channel, red green blue: invented demo values around the trade's usual 0.6. */
  gammas: readonly [number, number, number];
  /** Off-diagonal crosstalk: invented demo value (unmasked dyes need more correction than masked ones). */
  crosstalk: number;
  balance: ProfileDocument['balance'];
}

/** Invented stocks of the demo lab: two unmasked on polyester, one conventional masked stock for comparison. */
const demoStocks: readonly DemoStock[] = [
  {
    stock: {
      name: 'Glasswing 400',
      maker: 'Harrowgate Emulsions',
      iso: 400,
      process: 'C-41',
      masked: false,
      baseMaterial: 'tinted polyester (pale grey-blue)',
      frameFormats: ['135-24', '135-36'],
      notes:
        'Unmasked colour negative on a thin tinted polyester base. Rate at EI 400; takes one stop of push well.',
      // invented demo sheet
      recommendedEi: 400,
      latitudeUnderStops: 1,
      latitudeOverStops: 3,
      pushPullNotes: 'One stop of push (EI 800) keeps good colour; pulling is not advised.',
      reciprocityExponent: 1.3,
      handlingNotes:
        'The thin polyester base is stiff and slippery: cameras that load and wind the film themselves may misfeed it; load by hand where you can, and cut the leader square.',
    },
    gammas: [0.58, 0.61, 0.66],
    crosstalk: -0.06,
    balance: { cyanRed: 2, magentaGreen: -1, yellowBlue: -3 },
  },
  {
    stock: {
      name: 'Tealine 200',
      maker: 'Harrowgate Emulsions',
      iso: 200,
      process: 'C-41',
      masked: false,
      baseMaterial: 'clear polyester',
      frameFormats: ['135-36', '120'],
      notes: 'Unmasked colour negative on a clear polyester base; fine grain, high saturation.',
      // invented demo sheet
      recommendedEi: 160,
      latitudeUnderStops: 1,
      latitudeOverStops: 2,
      pushPullNotes: 'Rated a third of a stop slow for denser shadows; pushing raises contrast sharply.',
      reciprocityExponent: 1.35,
      handlingNotes:
        'Thin clear polyester: automatic loading in some cameras fails to catch it; the clear base also pipes light, so load in subdued light.',
    },
    gammas: [0.6, 0.62, 0.64],
    crosstalk: -0.05,
    balance: { cyanRed: 0, magentaGreen: 1, yellowBlue: -2 },
  },
  {
    stock: {
      name: 'Kestrel Colour 160',
      maker: 'Corvel Film Works',
      iso: 160,
      process: 'C-41',
      masked: true,
      baseMaterial: 'acetate with integral orange mask',
      frameFormats: ['120', '4x5'],
      notes: 'Conventional masked colour negative, kept for comparison with the unmasked stocks.',
      // invented demo sheet
      recommendedEi: 160,
      latitudeUnderStops: 2,
      latitudeOverStops: 3,
      pushPullNotes: 'Push or pull one stop with little loss.',
      reciprocityExponent: 1.3,
      handlingNotes: 'A conventional acetate base: loads in any camera.',
    },
    gammas: [0.55, 0.56, 0.57],
    crosstalk: -0.02,
    balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
  },
];

/** One input profile per kind of device, with invented demo values. */
const demoScanners: readonly CreateScannerRequest[] = [
  {
    name: 'Copy stand, bench 1',
    kind: 'camera-rig',
    inputProfile: {
      name: 'Copy stand, bench 1',
      encoding: 'linear',
      gamma: 1,
      blackLevel: [0.004, 0.004, 0.004],
      gains: [1, 1.18, 1.42],
    },
  },
  {
    name: 'Roll scanner, back room',
    kind: 'lab-scanner',
    inputProfile: {
      name: 'Roll scanner, back room',
      encoding: 'srgb',
      gamma: 1,
      blackLevel: [0.002, 0.002, 0.003],
      gains: [1.05, 1, 1.1],
    },
  },
  {
    name: 'Flatbed for sheet film',
    kind: 'flatbed',
    inputProfile: {
      name: 'Flatbed for sheet film',
      encoding: 'gamma',
      gamma: 2.2,
      blackLevel: [0.01, 0.01, 0.012],
      gains: [1, 1.02, 1.08],
    },
  },
];

// a 3.0 log exposure span (10 stops) covers a negative's useful range: common practice of the trade, from memory
const logExposureSpan = 3;

function demoDocument(
  demo: DemoStock,
  base: ProfileDocument['stock']['base'],
  documentId: string,
): ProfileDocument {
  const curve = (gamma: number) => ({
    points: [
      { logExposure: -logExposureSpan, density: 0 },
      // a slightly softer toe below the midpoint: invented demo shape
      { logExposure: -2, density: Number((gamma * 0.85).toFixed(4)) },
      { logExposure: 0, density: Number((gamma * logExposureSpan).toFixed(4)) },
    ],
  });
  const c = demo.crosstalk;
  return {
    schemaVersion: 1,
    id: documentId,
    version: 1,
    stock: { name: demo.stock.name, process: 'C-41', base, iso: demo.stock.iso },
    curves: { red: curve(demo.gammas[0]), green: curve(demo.gammas[1]), blue: curve(demo.gammas[2]) },
    crosstalk: [
      [1 - 2 * c, c, c],
      [c, 1 - 2 * c, c],
      [c, c, 1 - 2 * c],
    ],
    balance: demo.balance,
    tone: { contrast: 1.1, blackPoint: 0.01, whitePoint: 1 },
    saturation: demo.stock.masked ? 1 : 1.05,
  };
}

async function seedCatalogue(db: Kysely<Database>, at: Date, managerId: number | null): Promise<void> {
  for (const scanner of demoScanners) await insertScanner(db, scanner, at);
  for (const [i, demo] of demoStocks.entries()) {
    const stock = await insertStock(db, demo.stock, at);
    const documentId = `demo-${stock.name.toLowerCase().replace(/[^a-z0-9]+/g, '-')}`;
    const profile = await insertProfile(db, {
      stockId: stock.id,
      scannerId: null,
      name: `${stock.name}, house profile`,
      documentId,
      at,
      by: managerId,
    });
    const document = demoDocument(demo, baseOf(stock), documentId);
    const v1 = await insertDraft(db, {
      profile,
      parentVersionId: null,
      parameters: document,
      at,
      by: managerId,
    });
    await db
      .updateTable('profile_versions')
      .set({
        status: 'published',
        changelog: 'First house profile from the calibration roll',
        published_at: at.toISOString(),
        published_by: managerId,
      })
      .where('id', '=', v1.id)
      .execute();
    // the open draft: a small magenta-green correction under trial
    const trial = {
      ...document,
      balance: { ...document.balance, magentaGreen: document.balance.magentaGreen - 1 - i },
    };
    await insertDraft(db, { profile, parentVersionId: v1.id, parameters: trial, at, by: managerId });
  }
}

/** Seeds the demo stocks, one scanner per kind, and per stock a published profile version with an open draft. */
export const catalogueSeedStep: SeedStep = {
  name: 'stocks, scanners and profiles',
  async run(db, { clock }) {
    const manager = await db
      .selectFrom('users')
      .select('id')
      .where('role', '=', 'manager')
      .orderBy('id')
      .executeTakeFirst();
    await seedCatalogue(db, clock.now(), manager?.id ?? null);
  },
};
