/** Decimals of a currency's minor unit as the browser's Intl knows them (ISO 4217); 2 when it does not. */
export function minorDigits(currency: string): number {
  try {
    return (
      new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ??
      2
    );
  } catch {
    return 2;
  }
}

/** An amount in minor units shown in the currency, e.g. 2350 EUR → "€23.50". */
export function showMoney(amountMinor: number, currency: string): string {
  const digits = minorDigits(currency);
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency }).format(amountMinor / 10 ** digits);
  } catch {
    return `${(amountMinor / 10 ** digits).toFixed(digits)} ${currency}`;
  }
}

/** Major units typed by a person to whole minor units, e.g. 23.5 EUR → 2350. */
export function toMinor(major: number, currency: string): number {
  return Math.round(major * 10 ** minorDigits(currency));
}

export function toMajor(minor: number, currency: string): number {
  return minor / 10 ** minorDigits(currency);
}
