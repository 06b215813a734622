/** Who is calling and in which channel: from the session cookie or a personal API token. */
import { sql } from 'kysely';
import { db } from './db';
import type { Role } from './db/types';
import { hashSecret } from './secrets';
import { personForSession } from './sessions';

export const CHANNEL_COOKIE = 'wr_channel';
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
export const isUuid = (value: string | null | undefined): value is string => Boolean(value && UUID.test(value));

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

async function identityFor(person: NonNullable<App.Locals['person']>, wantedChannel: string | null | undefined, onlyChannel?: string): Promise<Identity> {
	const memberships = await activeChannels(person.id);
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

export async function identityFromSession(sessionId: string | undefined, wantedChannel: string | undefined): Promise<Identity> {
	if (!isUuid(sessionId)) return nobody;
	const person = await personForSession(sessionId);
	return person ? identityFor(person, wantedChannel) : nobody;
}

/** A bearer token works in the one channel it was created in. Revoked tokens and disabled memberships get nothing. */
export async function identityFromToken(token: string): Promise<Identity> {
	const row = await db
		.selectFrom('apiToken')
		.innerJoin('person', 'person.id', 'apiToken.personId')
		.select(['apiToken.id as tokenId', 'apiToken.channelId', 'person.id', 'person.email', 'person.name'])
		.where('apiToken.tokenHash', '=', hashSecret(token))
		.where('apiToken.revokedAt', 'is', null)
		.executeTakeFirst();
	if (!row) return nobody;
	await db.updateTable('apiToken').set({ lastUsedAt: sql<Date>`now()` }).where('id', '=', row.tokenId).execute();
	return identityFor({ id: row.id, email: row.email, name: row.name }, row.channelId, row.channelId);
}
