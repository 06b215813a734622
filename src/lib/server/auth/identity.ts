/** Who is calling and in which channel: from the session cookie or a personal API token. */
import { sql } from 'kysely';
import { db } from '../db';
import { compiledOnce } from '../db/compiled-once';
import type { Role } from '../db/types';
import { hashSecret } from './secrets';

export const CHANNEL_COOKIE = 'wr_channel';
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export const isUuid = (value: string | null | undefined): value is string =>
	Boolean(value && UUID.test(value));

export interface Identity {
	person: App.Locals['person'];
	channel: App.Locals['channel'];
	roles: Role[];
	channels: App.Locals['channels'];
}

const nobody: Identity = { person: null, channel: null, roles: [], channels: [] };

async function activeChannels(personId: string) {
	return db
		.selectFrom('membership')
		.innerJoin('channel', 'channel.id', 'membership.channelId')
		.select(['channel.id', 'channel.name', 'channel.frameRate', 'membership.roles'])
		.where('membership.personId', '=', personId)
		.where('membership.disabledAt', 'is', null)
		.orderBy('channel.name')
		.execute();
}

type Membership = Awaited<ReturnType<typeof activeChannels>>[number];

async function identityFor(
	person: NonNullable<App.Locals['person']>,
	wantedChannel: string | null | undefined,
	onlyChannel?: string
): Promise<Identity> {
	return identityOf(person, await activeChannels(person.id), wantedChannel, onlyChannel);
}

function identityOf(
	person: NonNullable<App.Locals['person']>,
	memberships: Membership[],
	wantedChannel: string | null | undefined,
	onlyChannel?: string
): Identity {
	const usable = onlyChannel ? memberships.filter((m) => m.id === onlyChannel) : memberships;
	if (usable.length === 0) return nobody; // every membership disabled: no access at all
	const current = usable.find((m) => m.id === wantedChannel) ?? usable[0];
	return {
		person,
		channel: { id: current.id, name: current.name, frameRate: current.frameRate },
		roles: current.roles,
		channels: memberships.map((m) => ({ id: m.id, name: m.name, roles: m.roles }))
	};
}

/** Who is calling, read on every request: compiled once (db/compiled-once.ts). */
const identityQuery = compiledOnce(['sessionId'], ({ sessionId }) =>
	db
		.selectFrom('personSession')
		.innerJoin('person', 'person.id', 'personSession.personId')
		.innerJoin('membership', 'membership.personId', 'person.id')
		.innerJoin('channel', 'channel.id', 'membership.channelId')
		.select([
			'person.id as personId',
			'person.email',
			'person.name as personName',
			'person.lastChannelId',
			'channel.id',
			'channel.name',
			'channel.frameRate',
			'membership.roles'
		])
		.where('personSession.id', '=', sessionId)
		.where('personSession.expiresAt', '>', sql<Date>`now()`)
		.where('membership.disabledAt', 'is', null)
		.orderBy('channel.name')
);

/**
 * The person behind a live session with their active channels, in one query (it runs on every
 * request): no row when the session is gone or expired, or every membership is disabled.
 */
export async function identityFromSession(
	sessionId: string | undefined,
	wantedChannel: string | undefined
): Promise<Identity> {
	if (!isUuid(sessionId)) return nobody;
	const rows = (await identityQuery(db, { sessionId })).rows;
	if (rows.length === 0) return nobody;
	const { personId, email, personName, lastChannelId } = rows[0];
	// This browser's choice first; a browser without one (a new sign-in) starts in the last chosen.
	const memberships = rows.map(({ id, name, frameRate, roles }) => ({
		id,
		name,
		frameRate,
		roles
	}));
	const wanted = memberships.some((m) => m.id === wantedChannel) ? wantedChannel : lastChannelId;
	return identityOf({ id: personId, email, name: personName }, memberships, wanted);
}

/** A bearer token works in the one channel it was created in. Revoked tokens and disabled memberships get nothing. */
export async function identityFromToken(token: string): Promise<Identity> {
	const row = await db
		.selectFrom('apiToken')
		.innerJoin('person', 'person.id', 'apiToken.personId')
		.select([
			'apiToken.id as tokenId',
			'apiToken.channelId',
			'person.id',
			'person.email',
			'person.name'
		])
		.where('apiToken.tokenHash', '=', hashSecret(token))
		.where('apiToken.revokedAt', 'is', null)
		.executeTakeFirst();
	if (!row) return nobody;
	// At most one write a minute per token: a script calling many times a second would otherwise
	// turn every read into a write.
	await db
		.updateTable('apiToken')
		.set({ lastUsedAt: sql<Date>`now()` })
		.where('id', '=', row.tokenId)
		.where((eb) =>
			eb.or([
				eb('lastUsedAt', 'is', null),
				eb('lastUsedAt', '<', sql<Date>`now() - interval '1 minute'`)
			])
		)
		.execute();
	return identityFor(
		{ id: row.id, email: row.email, name: row.name },
		row.channelId,
		row.channelId
	);
}
