import type { FilmProcess, Stock } from '@clearbase/contracts';

// Written out here rather than read from the contracts' zod enums, to keep zod out of the browser bundle; the Record
// type makes the compiler refuse a missing or unknown process.
const processLabels: Record<FilmProcess, string> = {
  'C-41': 'C-41',
  'E-6': 'E-6',
  'black-and-white': 'Black and white',
};

/** Every process, for pickers. */
export const processChoices = Object.keys(processLabels) as readonly FilmProcess[];

/** How a process is named on screen. */
export function processLabel(process: FilmProcess): string {
  return processLabels[process];
}

/** "Unmasked" or "Masked": whether the stock carries an integral orange mask. */
export function maskingLabel(stock: Pick<Stock, 'masked'>): string {
  return stock.masked ? 'Masked' : 'Unmasked';
}
