import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkSymbol, formatNumber, generateNumber, parseNumber } from '$lib/certificates/number';

// Reference: Douglas Crockford, "Base 32" (https://www.crockford.com/base32.html): symbols
// 0-9 A-Z without I L O U; I/L read as 1, O as 0; check symbol = value mod 37 with *~$=U for 32-36.
describe('certificate numbers', () => {
	it('computes the check symbol from the published definition', () => {
		// value of "0000000000000Z1" = 31*32 + 1 = 993; 993 mod 37 = 31 -> 'Z'
		expect(checkSymbol('0000000000000Z1')).toBe('Z');
		// 32 mod 37 = 32 -> '*'; 36 -> 'U' (the extra check symbols)
		expect(checkSymbol('000000000000010')).toBe('*');
		expect(checkSymbol('000000000000014')).toBe('U');
		// 37 mod 37 = 0
		expect(checkSymbol('000000000000015')).toBe('0');
	});

	it('issues 16 symbols in four groups, never with a symbol check, and at least 64 random bits', () => {
		const seen = new Set<string>();
		for (let i = 0; i < 2000; i++) {
			const n = generateNumber();
			expect(n).toMatch(/^[0-9A-HJKMNP-TV-Z]{15}([0-9A-HJKMNP-TV-Z]|U)$/);
			expect(n).toHaveLength(16);
			seen.add(n);
		}
		expect(seen.size).toBe(2000);
		// 15 data symbols x 5 bits = 75 bits drawn from the random source
		let calls = 0;
		generateNumber((k) => {
			calls += k;
			return new Uint8Array(k).fill(0xa5);
		});
		expect(calls * 8).toBeGreaterThanOrEqual(80);
	});

	it('forgives case, spacing, hyphens and I/L/O for 1/1/0', () => {
		fc.assert(
			fc.property(fc.uint8Array({ minLength: 10, maxLength: 10 }), (bytes) => {
				let served = false;
				const number = generateNumber((k) => (served ? crypto.getRandomValues(new Uint8Array(k)) : ((served = true), bytes.slice(0, k))));
				const formatted = formatNumber(number);
				const sloppy = formatted.toLowerCase().replace(/1/g, 'l').replace(/0/g, 'o').replace(/-/g, ' ');
				const parsed = parseNumber(` ${sloppy} `);
				expect(parsed).toEqual({ ok: true, number, formatted });
				const withI = parseNumber(number.replace(/1/g, 'I'));
				expect(withI.ok && withI.number).toBe(number);
			})
		);
	});

	it('refuses a wrong check symbol, any single changed symbol and swapped neighbours', () => {
		const number = generateNumber();
		const alphabet = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
		for (let i = 0; i < 16; i++) {
			for (const ch of alphabet) {
				if (ch === number[i]) continue;
				const typo = number.slice(0, i) + ch + number.slice(i + 1);
				const parsed = parseNumber(typo);
				expect(parsed.ok).toBe(false);
			}
		}
		const wrongCheck = parseNumber(number.slice(0, 15) + (number[15] === 'A' ? 'B' : 'A'));
		expect(wrongCheck).toMatchObject({ ok: false, reason: 'check' });
		for (let i = 0; i < 14; i++) {
			if (number[i] === number[i + 1]) continue;
			const swapped = number.slice(0, i) + number[i + 1] + number[i] + number.slice(i + 2);
			expect(parseNumber(swapped).ok).toBe(false);
		}
	});

	it('says what is wrong with the length and the characters', () => {
		expect(parseNumber('')).toMatchObject({ ok: false, reason: 'empty' });
		expect(parseNumber('ABCD-EFGH')).toMatchObject({ ok: false, reason: 'length' });
		expect(parseNumber('ABCD-EFGH-JKMN-PQR!')).toMatchObject({ ok: false, reason: 'characters' });
		expect(parseNumber('UUUU-UUUU-UUUU-UUUU')).toMatchObject({ ok: false, reason: 'characters' });
	});
});
