import { hash, verify } from '@node-rs/argon2';

// argon2id with the OWASP-recommended minimum (19 MiB, 2 iterations, 1 lane).
const OPTIONS = { memoryCost: 19456, timeCost: 2, outputLen: 32, parallelism: 1 } as const;

export function hashPassword(password: string): Promise<string> {
	return hash(password, OPTIONS);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
	try {
		return await verify(passwordHash, password);
	} catch {
		// A malformed stored hash is a failed match, never a crash on the sign-in page.
		return false;
	}
}

/** A hash of nothing, verified against when the account does not exist, so timing leaks nothing. */
let decoyHash: Promise<string> | null = null;
export function decoyPasswordHash(): Promise<string> {
	decoyHash ??= hashPassword('decoy-password-for-unknown-accounts');
	return decoyHash;
}
