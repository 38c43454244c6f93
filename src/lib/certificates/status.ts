/** Words for each verification answer; shared by the pages and the printable crew check. */
export type VerificationStatus = 'valid' | 'expired' | 'revoked' | 'replaced' | 'not-found';

export const statusWords: Record<VerificationStatus, string> = {
	valid: 'Valid',
	expired: 'Expired',
	revoked: 'Revoked',
	replaced: 'Replaced',
	'not-found': 'Not found'
};

/** A calendar date (YYYY-MM-DD) as "2 December 2026"; dates are UTC calendar days. */
export function longDate(iso: string): string {
	const [y, m, d] = iso.split('-').map(Number);
	const months = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];
	return `${d} ${months[m - 1]} ${y}`;
}

/** A UTC timestamp as "2 December 2026, 14:05 UTC". */
export function formatUtc(iso: string): string {
	return `${longDate(iso.slice(0, 10))}, ${iso.slice(11, 16)} UTC`;
}
