/**
 * The reader's locale for numbers and money, from the browser's Accept-Language header
 * (RFC 9110, 12.5.4): the first tag the runtime's Intl supports, else British English.
 */
export function readerLocale(acceptLanguage: string | null, fallback = 'en-GB'): string {
	if (!acceptLanguage) return fallback;
	const tags = acceptLanguage
		.slice(0, 500)
		.split(',')
		.map((part) => {
			const [tag, ...params] = part.trim().split(';');
			const q = params.map((p) => /^\s*q=([\d.]+)\s*$/.exec(p)?.[1]).find(Boolean);
			return { tag: tag.trim(), q: q ? Number(q) : 1 };
		})
		.filter((t) => /^[A-Za-z]{2,3}(-[A-Za-z0-9]{2,8})*$/.test(t.tag) && t.q > 0)
		.sort((a, b) => b.q - a.q);
	for (const { tag } of tags) {
		try {
			if (Intl.NumberFormat.supportedLocalesOf([tag]).length) return tag;
		} catch {
			// An ill-formed tag is skipped.
		}
	}
	return fallback;
}
