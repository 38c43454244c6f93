import fs from 'node:fs';
import path from 'node:path';
import { calculateJwkThumbprint, exportJWK, generateKeyPair, importJWK, type CryptoKey, type JWK } from 'jose';
import { config } from './config';

/**
 * The issuer's Ed25519 signing key (RFC 8037 OKP JWK): the ISSUER_KEY setting when set (several
 * processes must sign with one key, and a data folder is not shared between machines), otherwise
 * created on first use and kept in `DATA_DIR/issuer-key.json` with mode 0600. The public half is published at
 * `/.well-known/jwks.json` and in the issuer profile.
 */
export interface IssuerKey {
	kid: string;
	privateKey: CryptoKey;
	publicJwk: JWK;
}

const loaded = new Map<string, Promise<IssuerKey>>();

export function issuerKeyFile(dataDir = config.dataDir): string {
	return path.join(dataDir, 'issuer-key.json');
}

async function loadOrCreate(file: string): Promise<IssuerKey> {
	if (config.issuerKey) return fromPrivateJwk(config.issuerKey as JWK);
	let privateJwk: JWK;
	if (fs.existsSync(file)) {
		privateJwk = JSON.parse(fs.readFileSync(file, 'utf8'));
	} else {
		const pair = await generateKeyPair('EdDSA', { crv: 'Ed25519', extractable: true });
		privateJwk = await exportJWK(pair.privateKey);
		privateJwk.kid = await calculateJwkThumbprint(privateJwk);
		fs.mkdirSync(path.dirname(file), { recursive: true });
		try {
			// `wx`: a second process starting at the same moment keeps the first one's key
			fs.writeFileSync(file, JSON.stringify(privateJwk), { mode: 0o600, flag: 'wx' });
		} catch (e) {
			if ((e as NodeJS.ErrnoException).code !== 'EEXIST') throw e;
			privateJwk = JSON.parse(fs.readFileSync(file, 'utf8'));
		}
	}
	fs.chmodSync(file, 0o600);
	return fromPrivateJwk(privateJwk);
}

async function fromPrivateJwk(privateJwk: JWK): Promise<IssuerKey> {
	const { d: _secret, ...publicJwk } = privateJwk;
	const kid = privateJwk.kid ?? (await calculateJwkThumbprint(publicJwk));
	return {
		kid,
		privateKey: (await importJWK({ ...privateJwk, alg: 'EdDSA' }, 'EdDSA')) as CryptoKey,
		publicJwk: { ...publicJwk, kid, alg: 'EdDSA', use: 'sig' }
	};
}

/** The configured key or the one under the current DATA_DIR, loaded once per process. */
export function issuerKey(dataDir = config.dataDir): Promise<IssuerKey> {
	const file = issuerKeyFile(dataDir);
	let key = loaded.get(file);
	if (!key) {
		key = loadOrCreate(file);
		loaded.set(file, key);
		key.catch(() => loaded.delete(file));
	}
	return key;
}

/** The published key set (RFC 7517 §5). */
export async function publicJwks(): Promise<{ keys: JWK[] }> {
	return { keys: [(await issuerKey()).publicJwk] };
}
