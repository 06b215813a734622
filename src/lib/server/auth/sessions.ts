/** Sessions, sign-in checks and throttling. */
import { sql } from 'kysely';
import { createHash } from 'node:crypto';
import { db } from '../db';
import { checkPassword } from './passwords';

export const SESSION_DAYS = 30;
/** Guessing is rate-limited (NIST SP 800-63B §5.2.2): at most 10 failures per address in 15 minutes. */
const FAILURE_LIMIT = 10;
const FAILURE_WINDOW = '15 minutes';

const emailKey = (email: string) =>
	createHash('sha256').update(email.trim().toLowerCase()).digest('hex');

export async function verifyCredentials(email: string, password: string) {
	const key = emailKey(email);
	const recent = await db
		.selectFrom('signInFailure')
		.select((eb) => eb.fn.countAll<number>().as('failures'))
		.where('emailKey', '=', key)
		.where('at', '>', sql<Date>`now() - ${FAILURE_WINDOW}::interval`)
		.executeTakeFirstOrThrow();
	if (recent.failures >= FAILURE_LIMIT) return 'throttled' as const;

	const person = await db
		.selectFrom('person')
		.select(['id', 'email', 'name', 'passwordHash'])
		.where(sql`lower(email)`, '=', email.trim().toLowerCase())
		.executeTakeFirst();
	const active = person
		? await db
				.selectFrom('membership')
				.select('channelId')
				.where('personId', '=', person.id)
				.where('disabledAt', 'is', null)
				.executeTakeFirst()
		: undefined;
	const good = (await checkPassword(person?.passwordHash ?? null, password)) && Boolean(active);
	if (!good || !person) {
		await db.insertInto('signInFailure').values({ emailKey: key }).execute();
		return null;
	}
	await db.deleteFrom('signInFailure').where('emailKey', '=', key).execute();
	return { id: person.id, email: person.email, name: person.name };
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
