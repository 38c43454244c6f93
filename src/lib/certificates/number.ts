/**
 * Certificate numbers: 15 random Crockford base32 symbols (75 bits) and one check symbol,
 * shown as four groups of four, e.g. `7K2M-9QXD-4T0B-HWRC`.
 *
 * Encoding and check symbol follow Douglas Crockford, "Base 32" (crockford.com/base32.html):
 * the alphabet leaves out I, L, O and U; decoding reads I and L as 1 and O as 0, ignores case
 * and hyphens; the check symbol is the value modulo 37, written with the 32 symbols plus
 * `*~$=U`. Numbers whose check would be one of `*~$=` are never issued, so every number can
 * be read out and typed on a phone keyboard without symbols (this costs under 0.2 bit).
 * Pure: runs in the browser and on the server.
 */
const ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
const CHECK_ALPHABET = ALPHABET + '*~$=U';
const DATA_LENGTH = 15;
export const NUMBER_LENGTH = DATA_LENGTH + 1;

function valueOf(data: string): bigint {
	let value = 0n;
	for (const ch of data) value = value * 32n + BigInt(ALPHABET.indexOf(ch));
	return value;
}

export function checkSymbol(data: string): string {
	return CHECK_ALPHABET[Number(valueOf(data) % 37n)];
}

/** Groups a canonical 16-symbol number as XXXX-XXXX-XXXX-XXXX. */
export function formatNumber(canonical: string): string {
	return canonical.match(/.{1,4}/g)!.join('-');
}

/** A new random number; `randomBytes` is injectable for tests. */
export function generateNumber(randomBytes: (n: number) => Uint8Array = (n) => crypto.getRandomValues(new Uint8Array(n))): string {
	for (;;) {
		const bytes = randomBytes(10);
		let bits = 0n;
		for (const b of bytes) bits = (bits << 8n) | BigInt(b);
		bits >>= 5n; // 80 random bits down to 75
		let data = '';
		for (let i = 0; i < DATA_LENGTH; i++) {
			data = ALPHABET[Number(bits & 31n)] + data;
			bits >>= 5n;
		}
		const check = checkSymbol(data);
		if (ALPHABET.includes(check) || check === 'U') return data + check;
	}
}

export type ParsedNumber =
	| { ok: true; number: string; formatted: string }
	| { ok: false; reason: 'empty' | 'length' | 'characters' | 'check'; message: string };

/**
 * Reads a number as a person typed it: any case, spaces or hyphens anywhere, I/L for 1 and
 * O for 0. Refuses a wrong length, foreign characters and a check symbol that does not fit.
 */
export function parseNumber(input: string): ParsedNumber {
	const cleaned = input.toUpperCase().replace(/[\s\-‐‑–—_.]/g, '');
	if (!cleaned) return { ok: false, reason: 'empty', message: 'Type the certificate number.' };
	if (cleaned.length !== NUMBER_LENGTH)
		return { ok: false, reason: 'length', message: `A certificate number has ${NUMBER_LENGTH} letters and digits; this one has ${cleaned.length}.` };
	const data = cleaned.slice(0, DATA_LENGTH).replace(/[IL]/g, '1').replace(/O/g, '0');
	let check = cleaned[DATA_LENGTH];
	if (check === 'I' || check === 'L') check = '1';
	if (check === 'O') check = '0';
	if (![...data].every((ch) => ALPHABET.includes(ch)) || !(ALPHABET.includes(check) || check === 'U'))
		return { ok: false, reason: 'characters', message: 'A certificate number uses only the digits 0-9 and letters A-Z.' };
	if (checkSymbol(data) !== check)
		return { ok: false, reason: 'check', message: 'This number has a typing mistake: its last symbol does not match the rest. Check it against the certificate.' };
	return { ok: true, number: data + check, formatted: formatNumber(data + check) };
}
