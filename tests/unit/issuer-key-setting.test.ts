import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { calculateJwkThumbprint, exportJWK, generateKeyPair, importJWK, jwtVerify, SignJWT } from 'jose';
import { afterEach, describe, expect, it } from 'vitest';
import { ConfigError, parseConfig, reloadConfig } from '$lib/server/config';
import { issuerKey } from '$lib/server/issuer-key';

// Signing and verifying are checked with jose (a general-purpose JOSE library, RFC 7515/8037).

async function privateJwkText() {
	const pair = await generateKeyPair('EdDSA', { crv: 'Ed25519', extractable: true });
	return JSON.stringify(await exportJWK(pair.privateKey));
}

describe('the ISSUER_KEY setting', () => {
	const before = process.env.ISSUER_KEY;
	afterEach(() => {
		if (before === undefined) delete process.env.ISSUER_KEY;
		else process.env.ISSUER_KEY = before;
		reloadConfig();
	});

	it('is the signing key when set, and no key file is written', async () => {
		const text = await privateJwkText();
		process.env.ISSUER_KEY = text;
		reloadConfig();
		const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pw-issuer-'));
		const key = await issuerKey(dir);
		const { d: _d, ...publicHalf } = JSON.parse(text);
		expect(key.kid).toBe(await calculateJwkThumbprint(publicHalf));
		expect(key.publicJwk).not.toHaveProperty('d');
		expect(fs.existsSync(path.join(dir, 'issuer-key.json'))).toBe(false);
		const jwt = await new SignJWT({ sub: 'check' }).setProtectedHeader({ alg: 'EdDSA', kid: key.kid }).sign(key.privateKey);
		const verified = await jwtVerify(jwt, await importJWK({ ...publicHalf, alg: 'EdDSA' }, 'EdDSA'));
		expect(verified.payload.sub).toBe('check');
		fs.rmSync(dir, { recursive: true, force: true });
	});

	it('refuses a value that is not a private Ed25519 JWK, without printing it', async () => {
		const publicOnly = JSON.parse(await privateJwkText());
		delete publicOnly.d;
		for (const bad of ['not json', JSON.stringify(publicOnly), '{"kty":"RSA","d":"secret-part"}']) {
			let thrown: unknown;
			try {
				parseConfig({ ISSUER_KEY: bad });
			} catch (e) {
				thrown = e;
			}
			expect(thrown).toBeInstanceOf(ConfigError);
			expect((thrown as Error).message).toContain('ISSUER_KEY=(hidden)');
			expect((thrown as Error).message).not.toContain('secret-part');
		}
	});
});
