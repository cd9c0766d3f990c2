import type { ProfileDocument } from '@clearbase/contracts';
import type { StockRow } from '../db/database';

// colour negative films have a gamma around 0.6: common practice of the trade, from memory
const negativeGamma = 0.6;
// a 3.0 log exposure span (10 stops) covers a negative's useful range: common practice of the trade, from memory
const logExposureSpan = 3;

/** The document a new profile starts from: straight-line curves of slope 0.6, no crosstalk, neutral balance and tone. */
export function defaultProfileDocument(stock: StockRow, documentId: string): ProfileDocument {
  const line = {
    points: [
      { logExposure: -logExposureSpan, density: 0 },
      // rounded so the stored document reads 1.8, not 1.7999999999999998
      { logExposure: 0, density: Number((negativeGamma * logExposureSpan).toFixed(6)) },
    ],
  };
  return {
    schemaVersion: 1,
    id: documentId,
    version: 1,
    stock: { name: stock.name, process: 'C-41', base: baseOf(stock), iso: stock.iso },
    curves: { red: line, green: structuredClone(line), blue: structuredClone(line) },
    crosstalk: [
      [1, 0, 0],
      [0, 1, 0],
      [0, 0, 1],
    ],
    balance: { cyanRed: 0, magentaGreen: 0, yellowBlue: 0 },
    tone: { contrast: 1, blackPoint: 0, whitePoint: 1 },
    saturation: 1,
  };
}

/** The document's base kind for a stock: masked, tinted or clear. */
export function baseOf(stock: Pick<StockRow, 'masked' | 'base_material'>): 'masked' | 'tinted' | 'clear' {
  if (stock.masked === 1) return 'masked';
  return /tint/i.test(stock.base_material) ? 'tinted' : 'clear';
}
