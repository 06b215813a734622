/** Random one-time secrets (invite links, reset links, API tokens): shown once, stored only as a SHA-256 hash. */
import { createHash, randomBytes } from 'node:crypto';

export function newSecret(prefix = ''): string {
	return prefix + randomBytes(32).toString('base64url');
}

export function hashSecret(secret: string): string {
	return createHash('sha256').update(secret).digest('hex');
}
