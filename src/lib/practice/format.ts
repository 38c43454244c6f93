/** Times as the test pages print them: the same text on the server and in the browser. */
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "3 Mar 2025, 08:05 UTC". */
export function formatWhen(iso: string): string {
	const d = new Date(iso);
	const hh = String(d.getUTCHours()).padStart(2, '0');
	const mm = String(d.getUTCMinutes()).padStart(2, '0');
	return `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}, ${hh}:${mm} UTC`;
}

/**
 * "3 Mar 2025, 09:05 CET" in the given zone (the browser's own by default), for the reader;
 * the UTC value stays in `<time datetime>` (LocalTime.svelte).
 */
export function formatWhenLocal(iso: string, timeZone?: string): string {
	const d = new Date(iso);
	const parts = new Intl.DateTimeFormat('en-GB', {
		timeZone,
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit',
		hourCycle: 'h23',
		timeZoneName: 'short'
	}).formatToParts(d);
	const part = (type: Intl.DateTimeFormatPartTypes) => parts.find((p) => p.type === type)?.value ?? '';
	return `${part('day')} ${part('month')} ${part('year')}, ${part('hour')}:${part('minute')} ${part('timeZoneName')}`;
}

/** A score as printed, never broken from its sign: whole percent unless a fraction matters ("87.5 %"). */
export function formatScore(percent: number): string {
	return `${Number(percent.toFixed(1))}\u00a0%`;
}
