import { hash, verify } from '@node-rs/argon2';

/** Argon2id with the library's defaults (memory-hard; OWASP password storage guidance). */
export function hashPassword(password: string): Promise<string> {
	return hash(password);
}

export async function verifyPassword(passwordHash: string | null, password: string): Promise<boolean> {
	if (!passwordHash) return false;
	try {
		return await verify(passwordHash, password);
	} catch {
		return false;
	}
}
