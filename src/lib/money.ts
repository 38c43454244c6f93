/**
 * Money is stored as an integer count of the currency's minor unit (cents for EUR) with an
 * ISO 4217 code. The minor unit's size comes from Intl, so 1000 JPY stays 1000.
 */
export function formatMoney(minorUnits: number, currency: string, locale = 'en-GB'): string {
	const format = new Intl.NumberFormat(locale, { style: 'currency', currency });
	const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
	return format.format(minorUnits / 10 ** digits);
}
