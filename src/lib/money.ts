/**
 * Money is stored as an integer count of the currency's minor unit (cents for EUR) with an
 * ISO 4217 code. The minor unit's size comes from Intl, so 1000 JPY stays 1000.
 */
export function formatMoney(minorUnits: number, currency: string, locale = 'en-GB'): string {
	const { format, digits } = formatter(locale, currency);
	return format.format(minorUnits / 10 ** digits);
}

/** Building an Intl.NumberFormat costs far more than using one: one per locale and currency. */
const formatters = new Map<string, { format: Intl.NumberFormat; digits: number }>();

function formatter(locale: string, currency: string) {
	const key = `${locale} ${currency}`;
	let found = formatters.get(key);
	if (!found) {
		const format = new Intl.NumberFormat(locale, { style: 'currency', currency });
		found = { format, digits: format.resolvedOptions().maximumFractionDigits ?? 2 };
		formatters.set(key, found);
	}
	return found;
}
