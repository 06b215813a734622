/**
 * Sign-in does the same work for every address (OWASP ASVS 4.0.3 V2.2.1 / OWASP Authentication
 * Cheat Sheet, "authentication responses": an unknown address must not answer faster than a known
 * one). The work is counted, not timed: every path runs exactly one Argon2 verification with the
 * parameters of a real stored hash. The counter wraps the real `verify` of @node-rs/argon2.
 * Argon2 hashes are PHC strings, `$argon2id$v=19$m=<KiB>,t=<passes>,p=<lanes>$<salt>$<hash>`
 * (RFC 9106 §3.1 names the parameters; the PHC string format is the reference implementation's).
 */
import { describe, expect, test } from 'vitest';
import { verify } from '@node-rs/argon2';
import { checkPassword, hashPassword } from '$lib/server/auth/passwords';

/** The algorithm, version and cost parameters of a PHC-format Argon2 hash. */
const costOf = (phc: string) => phc.split('$').slice(1, 4).join('$');

function countingVerify() {
	const verified: string[] = [];
	const verifyHash = (stored: string, password: string) => {
		verified.push(stored);
		return verify(stored, password);
	};
	return { verified, verifyHash };
}

describe('checkPassword', () => {
	test('a known address with a wrong password, an unknown one, and an account without a password cost one verification each', async () => {
		const real = await hashPassword('two new ball joints and a tie rod');
		const { verified, verifyHash } = countingVerify();
		expect(await checkPassword(real, 'not the right words at all', verifyHash)).toBe(false);
		expect(await checkPassword(null, 'not the right words at all', verifyHash)).toBe(false);
		expect(await checkPassword('not a hash', 'not the right words at all', verifyHash)).toBe(false);
		expect(verified).toHaveLength(3);
		// The stand-in hash costs what a real one costs: same algorithm, version, memory, passes, lanes.
		expect(costOf(real)).toMatch(/^argon2id\$v=19\$m=\d+,t=\d+,p=\d+$/);
		expect(costOf(verified[1])).toBe(costOf(real));
		expect(costOf(verified[2])).toBe(costOf(real));
	});

	test('the right password passes, and the stand-in hash never lets anyone in', async () => {
		const real = await hashPassword('two new ball joints and a tie rod');
		const { verified, verifyHash } = countingVerify();
		expect(await checkPassword(real, 'two new ball joints and a tie rod', verifyHash)).toBe(true);
		expect(verified).toEqual([real]);
		for (const guess of ['', 'two new ball joints and a tie rod', 'wrenchroll'])
			expect(await checkPassword(null, guess, verifyHash)).toBe(false);
	});
});
