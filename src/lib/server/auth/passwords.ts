/**
 * Password rules follow NIST SP 800-63B: a length floor and ceiling, no composition rules,
 * and a check against a list of known-breached passwords (Mozilla's fxa-common-password-list,
 * the top of a public breach corpus). Hashing is Argon2id from @node-rs/argon2.
 */
import { randomBytes } from 'node:crypto';
import { hash, verify } from '@node-rs/argon2';
import commonPasswords from 'fxa-common-password-list';

/** NIST SP 800-63B-4 asks for at least 15 characters where the password is the only factor. */
export const PASSWORD_MIN = 15;
export const PASSWORD_MAX = 128;

/** Returns a sentence for the person, or null when the password is acceptable. */
export function passwordProblem(password: string): string | null {
	if (password.length < PASSWORD_MIN)
		return `Use at least ${PASSWORD_MIN} characters: a short phrase is easier to remember than symbols.`;
	if (password.length > PASSWORD_MAX) return `Use at most ${PASSWORD_MAX} characters.`;
	if (commonPasswords.test(password.toLowerCase()))
		return 'That password appears in lists of leaked passwords. Pick another.';
	return null;
}

export function hashPassword(password: string): Promise<string> {
	return hash(password);
}

let standIn: Promise<string> | null = null;
/**
 * A hash of a random password, made like every real one (same algorithm and cost): sign-in verifies
 * against it when the address has no usable hash, so an unknown address costs what a known one does.
 */
export function standInHash(): Promise<string> {
	standIn ??= hash(randomBytes(32).toString('base64url'));
	return standIn;
}

/**
 * Whether the password matches the stored hash. Always runs exactly one Argon2 verification (against
 * the stand-in hash when there is no real one), so the answer takes as long for an unknown address
 * as for a known one. `verifyHash` is @node-rs/argon2's verify; tests pass one that counts calls.
 */
export async function checkPassword(
	passwordHash: string | null,
	password: string,
	verifyHash: (hash: string, password: string) => Promise<boolean> = verify
): Promise<boolean> {
	const real = passwordHash?.startsWith('$argon2') ? passwordHash : null;
	try {
		const matches = await verifyHash(real ?? (await standInHash()), password);
		return matches && real !== null;
	} catch {
		return false;
	}
}
