/**
 * Shows an amount in minor units in its currency, with as many decimals as ISO 4217 gives the currency.
 *
 * @example
 * formatMoney(2350, 'EUR'); // '€23.50'
 * formatMoney(1200, 'JPY'); // '¥1,200'
 */
export function formatMoney(amountMinor: number, currency: string, locale = 'en-GB'): string {
  const format = new Intl.NumberFormat(locale, { style: 'currency', currency });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(amountMinor / 10 ** digits);
}
