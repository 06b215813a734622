/** The crew of a channel: invites, roles, disabling, and the one-time links for passwords. */
import { sql, type Transaction } from 'kysely';
import { db } from '../db';
import { compiledOnce } from '../db/compiled-once';
import type { Database, Role } from '../db/types';
import { DomainError, notFound } from '../http/api';
import {
	keysetAfter,
	keysetOrderBy,
	keysetPage,
	keysetSelections,
	type SortKey
} from '../http/keyset';
import type { PageQuery } from '$lib/schemas/paging';
import { hashSecret, newSecret } from '../auth/secrets';
import { queueMail } from '../mail/outbox';
import { inviteMail, resetMail } from '../mail/messages';
import { hashPassword, passwordProblem } from '../auth/passwords';
import { clearCounter, mailCounters, takeAttempt } from '../auth/throttle';
import { signInAddressCounter } from '../auth/sessions';
import { isUuid } from '../auth/identity';
import { personByAddress, type MailLinkRequest } from '../auth/unlock';

const INVITE_DAYS = 7;
const RESET_HOURS = 1;

/** The channel's members with what the crew page and API show of each. */
function crewQuery(channelId: string) {
	return db
		.selectFrom('membership')
		.innerJoin('person', 'person.id', 'membership.personId')
		.select([
			'person.id',
			'person.name',
			'person.email',
			'membership.roles',
			'membership.disabledAt',
			'membership.createdAt',
			sql<boolean>`person.password_hash IS NOT NULL`.as('hasPassword')
		])
		.where('membership.channelId', '=', channelId);
}

export type CrewMember = Awaited<ReturnType<ReturnType<typeof crewQuery>['execute']>>[number];

const crewOrder: SortKey[] = [
	{ expression: sql`person.name`, direction: 'asc', kind: 'text' },
	{ expression: sql`person.id`, direction: 'asc', kind: 'uuid' }
];

/** One page of the crew by name (keyset-paged: `query.after` is the previous page's `next`). */
export async function crewPage(channelId: string, query: PageQuery) {
	const rows = await crewQuery(channelId)
		.select(keysetSelections(crewOrder))
		.where(keysetAfter('name:asc', crewOrder, query.after))
		.orderBy(keysetOrderBy(crewOrder))
		.limit(query.limit + 1)
		.execute();
	return keysetPage('name:asc', crewOrder, rows, query.limit);
}

/**
 * The crew page's page: as `crewPage`, with how many members the channel has and how many are
 * active, read in the same query (uncorrelated subqueries, so PostgreSQL counts once per page).
 */
export async function crewPageWithCounts(channelId: string, query: PageQuery) {
	const rows = await crewQuery(channelId)
		.select((eb) => [
			eb
				.selectFrom('membership as counted')
				.select((inner) => inner.fn.countAll<string>().as('count'))
				.where('counted.channelId', '=', channelId)
				.as('memberCount'),
			eb
				.selectFrom('membership as counted')
				.select((inner) => inner.fn.countAll<string>().as('count'))
				.where('counted.channelId', '=', channelId)
				.where('counted.disabledAt', 'is', null)
				.as('activeCount')
		])
		.select(keysetSelections(crewOrder))
		.where(keysetAfter('name:asc', crewOrder, query.after))
		.orderBy(keysetOrderBy(crewOrder))
		.limit(query.limit + 1)
		.execute();
	const page = keysetPage('name:asc', crewOrder, rows, query.limit);
	return {
		items: page.items.map(({ memberCount: _all, activeCount: _active, ...member }) => member),
		next: page.next,
		counts: {
			members: Number(rows[0]?.memberCount ?? 0),
			active: Number(rows[0]?.activeCount ?? 0)
		}
	};
}

/**
 * The channel's active members with their roles, by name: whom an episode or a shoot day can
 * assign. A query to run or to nest in another (the episode forms' choices).
 */
export const activeCrewSelect = (channelId: string) =>
	db
		.selectFrom('membership')
		.innerJoin('person', 'person.id', 'membership.personId')
		.select(['person.id', 'person.name', 'membership.roles'])
		.where('membership.channelId', '=', channelId)
		.where('membership.disabledAt', 'is', null)
		.orderBy('person.name');

/** Read by every producer's episode page (its form's choices): compiled once (db/compiled-once.ts). */
const activeCrewQuery = compiledOnce(['channelId'], ({ channelId }) => activeCrewSelect(channelId));

export async function activeCrew(channelId: string) {
	return (await activeCrewQuery(db, { channelId })).rows;
}

/** Adds a person to the crew; a new person gets a link to set a password, someone already known gets a note. */
export async function invitePerson(
	channelId: string,
	inviter: { id: string; name: string },
	input: { email: string; name: string; roles: Role[] },
	origin: string
) {
	return db.transaction().execute(async (trx) => {
		const channel = await trx
			.selectFrom('channel')
			.select(['name'])
			.where('id', '=', channelId)
			.executeTakeFirstOrThrow();
		let person = await trx
			.selectFrom('person')
			.select(['id', 'name', 'email', 'passwordHash'])
			.where(sql`lower(email)`, '=', input.email.toLowerCase())
			.executeTakeFirst();
		if (!person) {
			person = await trx
				.insertInto('person')
				.values({ email: input.email, name: input.name })
				.returning(['id', 'name', 'email', 'passwordHash'])
				.executeTakeFirstOrThrow();
		}
		const existing = await trx
			.selectFrom('membership')
			.select('personId')
			.where('channelId', '=', channelId)
			.where('personId', '=', person.id)
			.executeTakeFirst();
		if (existing)
			throw new DomainError(
				409,
				`${input.email} is already on the ${channel.name} crew. Change their roles instead.`,
				{ email: ['Already on the crew.'] }
			);
		await trx
			.insertInto('membership')
			.values({ channelId, personId: person.id, roles: input.roles, invitedBy: inviter.id })
			.execute();

		const secret = newSecret();
		await trx
			.insertInto('oneTimeLink')
			.values({
				personId: person.id,
				channelId,
				purpose: 'invite',
				tokenHash: hashSecret(secret),
				expiresAt: new Date(Date.now() + INVITE_DAYS * 24 * 3600 * 1000)
			})
			.execute();
		const link = `${origin}/welcome/${secret}`;
		await queueMail(trx, {
			to: person.email,
			channelId,
			...inviteMail({
				channelName: channel.name,
				inviterName: inviter.name,
				link,
				roles: input.roles
			})
		});
		return { id: person.id, email: person.email, name: person.name, roles: input.roles };
	});
}

/**
 * Changes roles or disables a member; the channel never loses its last active producer. Disabling
 * revokes the person's API tokens for this channel, so enabling them again brings none back.
 */
export async function updateMember(
	channelId: string,
	actorId: string,
	personId: string,
	change: { roles?: Role[]; disabled?: boolean }
) {
	if (!isUuid(personId)) throw notFound('That crew member');
	return db.transaction().execute(async (trx) => {
		const member = await trx
			.selectFrom('membership')
			.selectAll()
			.where('channelId', '=', channelId)
			.where('personId', '=', personId)
			.forUpdate()
			.executeTakeFirst();
		if (!member) throw notFound('That crew member');
		const roles = change.roles ?? member.roles;
		const disabledAt =
			change.disabled === undefined
				? member.disabledAt
				: change.disabled
					? (member.disabledAt ?? new Date())
					: null;
		const losesProducer =
			member.roles.includes('producer') &&
			!member.disabledAt &&
			(!roles.includes('producer') || disabledAt);
		if (losesProducer) {
			const others = await trx
				.selectFrom('membership')
				.select((eb) => eb.fn.countAll<number>().as('count'))
				.where('channelId', '=', channelId)
				.where('personId', '!=', personId)
				.where('disabledAt', 'is', null)
				.where(sql<boolean>`'producer' = ANY(roles)`)
				.executeTakeFirstOrThrow();
			if (others.count === 0) {
				throw new DomainError(
					409,
					personId === actorId
						? 'You are the only producer: make someone else a producer first.'
						: 'This is the only producer: make someone else a producer first.'
				);
			}
		}
		await trx
			.updateTable('membership')
			.set({ roles, disabledAt })
			.where('channelId', '=', channelId)
			.where('personId', '=', personId)
			.execute();
		if (disabledAt && !member.disabledAt)
			await trx
				.updateTable('apiToken')
				.set({ revokedAt: sql<Date>`now()` })
				.where('personId', '=', personId)
				.where('channelId', '=', channelId)
				.where('revokedAt', 'is', null)
				.execute();
		return { id: personId, roles, disabledAt };
	});
}

/**
 * Always answers the same way for known and unknown addresses, so the form never tells a stranger
 * which addresses have accounts. Limited per address asked for and per client asking (reset and
 * unlock mail share the limits); a new link voids the person's older reset links.
 */
export const requestPasswordReset: MailLinkRequest = async (email, origin, clientAddress) => {
	const taken = await takeAttempt(mailCounters(email, clientAddress));
	if (!taken.ok) return { sent: false, retryAfter: taken.retryAfter };
	const person = await personByAddress(email).executeTakeFirst();
	if (!person) return { sent: true };
	await db.transaction().execute(async (trx) => {
		await voidLinks(trx, person.id, ['reset']);
		const secret = newSecret();
		await trx
			.insertInto('oneTimeLink')
			.values({
				personId: person.id,
				purpose: 'reset',
				tokenHash: hashSecret(secret),
				expiresAt: new Date(Date.now() + RESET_HOURS * 3600 * 1000)
			})
			.execute();
		await queueMail(trx, { to: person.email, ...resetMail({ link: `${origin}/reset/${secret}` }) });
	});
	return { sent: true };
};

/** Ends a person's live links of these purposes (unused ones, and opened unlock grants). */
export async function voidLinks(
	trx: Transaction<Database>,
	personId: string,
	purposes: ('reset' | 'unlock')[]
) {
	await trx
		.updateTable('oneTimeLink')
		.set({ expiresAt: sql<Date>`now()` })
		.where('personId', '=', personId)
		.where('purpose', 'in', purposes)
		.where('expiresAt', '>', sql<Date>`now()`)
		.execute();
}

/** Looks up an unused, unexpired link (invite or reset). */
export async function findLink(secret: string, purpose: 'invite' | 'reset') {
	return db
		.selectFrom('oneTimeLink')
		.innerJoin('person', 'person.id', 'oneTimeLink.personId')
		.leftJoin('channel', 'channel.id', 'oneTimeLink.channelId')
		.select([
			'oneTimeLink.id',
			'person.id as personId',
			'person.email',
			'person.name',
			'channel.name as channelName',
			'person.passwordHash'
		])
		.where('oneTimeLink.tokenHash', '=', hashSecret(secret))
		.where('oneTimeLink.purpose', '=', purpose)
		.where('oneTimeLink.usedAt', 'is', null)
		.where('oneTimeLink.expiresAt', '>', sql<Date>`now()`)
		.executeTakeFirst();
}

/**
 * Sets the password through a link and uses the link up. A reset also ends everything the old
 * password let in: every session, every API token, the other reset and unlock links; and it clears
 * the address's count of failed sign-ins (whoever guessed, the guesses were at the old password).
 */
export async function setPasswordWithLink(
	secret: string,
	purpose: 'invite' | 'reset',
	password: string
) {
	const problem = passwordProblem(password);
	if (problem) throw new DomainError(400, problem, { password: [problem] });
	const link = await findLink(secret, purpose);
	if (!link)
		throw new DomainError(404, 'This link has expired or was already used. Ask for a new one.');
	const passwordHash = await hashPassword(password);
	await db.transaction().execute(async (trx) => {
		const used = await trx
			.updateTable('oneTimeLink')
			.set({ usedAt: new Date() })
			.where('id', '=', link.id)
			.where('usedAt', 'is', null)
			.executeTakeFirst();
		if (Number(used.numUpdatedRows) !== 1)
			throw new DomainError(404, 'This link was already used. Ask for a new one.');
		await trx.updateTable('person').set({ passwordHash }).where('id', '=', link.personId).execute();
		if (purpose !== 'reset') return;
		await trx.deleteFrom('personSession').where('personId', '=', link.personId).execute();
		await trx
			.updateTable('apiToken')
			.set({ revokedAt: sql<Date>`now()` })
			.where('personId', '=', link.personId)
			.where('revokedAt', 'is', null)
			.execute();
		await voidLinks(trx, link.personId, ['reset', 'unlock']);
	});
	if (purpose === 'reset') await clearCounter(signInAddressCounter(link.email));
	return { email: link.email };
}
