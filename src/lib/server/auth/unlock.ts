/**
 * Unlock links: how the owner of an address gets in while someone else's guessing holds it at its
 * limit. The owner asks for a link (mailed only to the address itself, and limited like reset
 * mail), opens it and presses its button; that browser then gets a grant (a cookie holding the
 * link's secret) for UNLOCK_GRANT_MINUTES, and its sign-ins for that address count against the
 * grant's own limit instead of the address's and the client's. The password is still needed: the
 * link proves the mailbox, not the person.
 */
import { sql } from 'kysely';
import { db } from '../db';
import { queueMail } from '../mail/outbox';
import { unlockMail } from '../mail/messages';
import { hashSecret, newSecret } from './secrets';
import { mailCounters, takeAttempt } from './throttle';
import { UNLOCK_GRANT_MINUTES, UNLOCK_LINK_MINUTES } from './throttle-limits';

export const UNLOCK_COOKIE = 'wr_unlock';
const SECRET_MAX = 100;

/** Asks for a link mailed to an address (reset, unlock): answers the same for any address. */
export type MailLinkRequest = (
	email: string,
	origin: string,
	clientAddress: string
) => Promise<{ sent: true } | { sent: false; retryAfter: number }>;

/** The person an e-mail address names, compared as sign-in compares it (trimmed, any case). */
export const personByAddress = (email: string) =>
	db
		.selectFrom('person')
		.select(['id', 'email'])
		.where(sql`lower(email)`, '=', email.trim().toLowerCase());

/** Mails an unlock link to an address of an active crew member; answers the same for any address. */
export const requestUnlockLink: MailLinkRequest = async (email, origin, clientAddress) => {
	const taken = await takeAttempt(mailCounters(email, clientAddress));
	if (!taken.ok) return { sent: false, retryAfter: taken.retryAfter };
	const person = await personByAddress(email)
		.where(({ exists, selectFrom }) =>
			exists(
				selectFrom('membership')
					.select('membership.personId')
					.whereRef('membership.personId', '=', 'person.id')
					.where('membership.disabledAt', 'is', null)
			)
		)
		.executeTakeFirst();
	if (!person) return { sent: true };
	await db.transaction().execute(async (trx) => {
		// One unlock link at a time: a new one voids those not yet opened.
		await trx
			.updateTable('oneTimeLink')
			.set({ expiresAt: sql<Date>`now()` })
			.where('personId', '=', person.id)
			.where('purpose', '=', 'unlock')
			.where('usedAt', 'is', null)
			.where('expiresAt', '>', sql<Date>`now()`)
			.execute();
		const secret = newSecret();
		await trx
			.insertInto('oneTimeLink')
			.values({
				personId: person.id,
				purpose: 'unlock',
				tokenHash: hashSecret(secret),
				expiresAt: new Date(Date.now() + UNLOCK_LINK_MINUTES * 60 * 1000)
			})
			.execute();
		await queueMail(trx, {
			to: person.email,
			...unlockMail({ link: `${origin}/unlock/${secret}`, minutes: UNLOCK_LINK_MINUTES })
		});
	});
	return { sent: true };
};

/** The address an unopened, unexpired unlock link is for. */
export async function findUnlockLink(secret: string) {
	if (secret.length > SECRET_MAX) return undefined;
	return db
		.selectFrom('oneTimeLink')
		.innerJoin('person', 'person.id', 'oneTimeLink.personId')
		.select(['oneTimeLink.id', 'person.email'])
		.where('oneTimeLink.tokenHash', '=', hashSecret(secret))
		.where('oneTimeLink.purpose', '=', 'unlock')
		.where('oneTimeLink.usedAt', 'is', null)
		.where('oneTimeLink.expiresAt', '>', sql<Date>`now()`)
		.executeTakeFirst();
}

/** Opens an unlock link once: from now on it is a grant until its new expiry. False when it was not usable. */
export async function openUnlockLink(secret: string): Promise<boolean> {
	if (secret.length > SECRET_MAX) return false;
	const opened = await db
		.updateTable('oneTimeLink')
		.set({
			usedAt: sql<Date>`now()`,
			expiresAt: sql<Date>`now() + make_interval(mins => ${UNLOCK_GRANT_MINUTES})`
		})
		.where('tokenHash', '=', hashSecret(secret))
		.where('purpose', '=', 'unlock')
		.where('usedAt', 'is', null)
		.where('expiresAt', '>', sql<Date>`now()`)
		.executeTakeFirst();
	return Number(opened.numUpdatedRows) === 1;
}

/** The id of the live grant this browser holds for the address, if any. */
export async function unlockGrantFor(
	secret: string | undefined,
	normalisedEmail: string
): Promise<string | null> {
	if (!secret || secret.length > SECRET_MAX) return null;
	const grant = await db
		.selectFrom('oneTimeLink')
		.innerJoin('person', 'person.id', 'oneTimeLink.personId')
		.select('oneTimeLink.id')
		.where('oneTimeLink.tokenHash', '=', hashSecret(secret))
		.where('oneTimeLink.purpose', '=', 'unlock')
		.where('oneTimeLink.usedAt', 'is not', null)
		.where('oneTimeLink.expiresAt', '>', sql<Date>`now()`)
		.where(sql`lower(person.email)`, '=', normalisedEmail)
		.executeTakeFirst();
	return grant?.id ?? null;
}
