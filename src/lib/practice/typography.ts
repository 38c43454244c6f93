/**
 * The signs the rest of the app prints, for text typed in plain ASCII (the question banks are
 * YAML written on any keyboard): "2 x pi x 225" reads "2 × π × 225", "20 degC" reads "20 °C",
 * "D^2" reads "D²", "1.885 m2" reads "1.885 m²". Pure; applied where bank text is loaded.
 */
export function tradeTypography(text: string): string {
	return text
		.replace(/(\S) x (?=\S)/g, '$1 × ')
		.replace(/\bpi\b/g, 'π')
		.replace(/(\d) ?deg ?C\b/g, '$1 °C')
		.replace(/(\d) ?deg ?F\b/g, '$1 °F')
		.replace(/\^2\b/g, '²')
		.replace(/\^3\b/g, '³')
		.replace(/(\d) ?(mm|cm|m|ft|in)([23])\b/g, (_m, n: string, u: string, p: string) => `${n} ${u}${p === '2' ? '²' : '³'}`);
}
