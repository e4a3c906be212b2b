/**
 * Amounts as the API keeps them: whole numbers in the smallest unit of the currency (cents for
 * eur). How many decimals a currency has comes from Intl, so yen and dinars come out right too.
 */

/** Decimal places of a currency's smallest unit (2 for eur, 0 for jpy). */
export function minorUnitDigits(currency: string): number {
  try {
    return new Intl.NumberFormat('en', { style: 'currency', currency: currency.toUpperCase() }).resolvedOptions()
      .maximumFractionDigits ?? 2;
  } catch {
    return 2;
  }
}

/** 4900 eur → 49 */
export function toMajor(minor: number, currency: string): number {
  return minor / 10 ** minorUnitDigits(currency);
}

/** 49.5 eur → 4950 (rounded to the smallest unit). */
export function toMinor(major: number, currency: string): number {
  return Math.round(major * 10 ** minorUnitDigits(currency));
}

/** "€49.00" in the reader's locale (or the one given); an unknown currency code is shown after the number. */
export function formatMoney(minor: number, currency: string, locale?: string): string {
  const code = currency.toUpperCase();
  const digits = minorUnitDigits(code);
  try {
    return new Intl.NumberFormat(locale, { style: 'currency', currency: code }).format(minor / 10 ** digits);
  } catch {
    return `${(minor / 10 ** digits).toFixed(digits)} ${code}`;
  }
}
