/** The headers every answer carries, pages, API and Auth.js's own alike. */
export const SECURITY_HEADERS: ReadonlyArray<readonly [string, string]> = [
	['X-Content-Type-Options', 'nosniff'],
	['Referrer-Policy', 'same-origin'],
	['X-Frame-Options', 'DENY']
];

/** Answers for a signed-in person, and every API answer, are never stored by a cache. */
export const NO_STORE = ['Cache-Control', 'no-store'] as const;

export function setSecurityHeaders(headers: Headers, private_: boolean): void {
	for (const [name, value] of SECURITY_HEADERS) headers.set(name, value);
	if (private_) headers.set(...NO_STORE);
}
