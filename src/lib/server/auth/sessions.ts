/** Sessions, sign-in checks and throttling. */
import { sql } from 'kysely';
import { db } from '../db';
import { checkPassword } from './passwords';
import { clientKey } from './client-address';
import { giveBack, takeAttempt, type Counter } from './throttle';
import { THROTTLE_LIMITS } from './throttle-limits';
import { unlockGrantFor } from './unlock';

export const SESSION_DAYS = 30;

/** How an address is compared and counted: trimmed, lower case. */
export const normalEmail = (email: string) => email.trim().toLowerCase();

export type ThrottledBy = 'address' | 'client';

/** The per-address counter of failed sign-ins; a completed password reset clears it. */
export const signInAddressCounter = (email: string): Counter<ThrottledBy> => ({
	kind: 'address',
	key: `sign-in address ${normalEmail(email)}`,
	limit: THROTTLE_LIMITS.signInAddress
});

export type SignInOutcome =
	| { ok: true; person: { id: string; email: string; name: string } }
	| { ok: false; throttled: null }
	| { ok: false; throttled: ThrottledBy; retryAfter: number };

/**
 * Checks an e-mail and password. Every attempt is counted before the password is looked at, per
 * address and per client (or, for a browser holding an unlock grant for this address, against that
 * grant alone), and a successful one gives its count back: only failures stay counted. Known and
 * unknown addresses cost the same work: one query, one Argon2 verification.
 */
export async function verifyCredentials(
	email: string,
	password: string,
	from: { clientAddress: string; unlockSecret?: string }
): Promise<SignInOutcome> {
	const address = normalEmail(email);
	const grant = await unlockGrantFor(from.unlockSecret, address);
	const counters: Counter<ThrottledBy>[] = grant
		? [{ kind: 'address', key: `unlock grant ${grant}`, limit: THROTTLE_LIMITS.signInUnlocked }]
		: [
				signInAddressCounter(address),
				{
					kind: 'client',
					key: `sign-in client ${clientKey(from.clientAddress)}`,
					limit: THROTTLE_LIMITS.signInClient
				}
			];
	const taken = await takeAttempt(counters);
	if (!taken.ok) return { ok: false, throttled: taken.kind, retryAfter: taken.retryAfter };

	const person = await db
		.selectFrom('person')
		.select([
			'id',
			'email',
			'name',
			'passwordHash',
			sql<boolean>`EXISTS (SELECT 1 FROM membership
				WHERE membership.person_id = person.id AND membership.disabled_at IS NULL)`.as('active')
		])
		.where(sql`lower(email)`, '=', address)
		.executeTakeFirst();
	const matches = await checkPassword(person?.passwordHash ?? null, password);
	if (!person || !matches || !person.active) return { ok: false, throttled: null };
	await giveBack(counters);
	return { ok: true, person: { id: person.id, email: person.email, name: person.name } };
}

export async function openSession(personId: string): Promise<string> {
	const row = await db
		.insertInto('personSession')
		.values({ personId, expiresAt: new Date(Date.now() + SESSION_DAYS * 24 * 3600 * 1000) })
		.returning('id')
		.executeTakeFirstOrThrow();
	return row.id;
}

export async function closeSession(sessionId: string): Promise<void> {
	await db.deleteFrom('personSession').where('id', '=', sessionId).execute();
}
