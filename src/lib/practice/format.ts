/** Times as the test pages print them: the same text on the server and in the browser. */
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "3 Mar 2025, 08:05 UTC". */
export function formatWhen(iso: string): string {
	const d = new Date(iso);
	const hh = String(d.getUTCHours()).padStart(2, '0');
	const mm = String(d.getUTCMinutes()).padStart(2, '0');
	return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}, ${hh}:${mm} UTC`;
}

/** A score as printed, never broken from its sign: whole percent unless a fraction matters ("87.5 %"). */
export function formatScore(percent: number): string {
	return `${Number(percent.toFixed(1))}\u00a0%`;
}
