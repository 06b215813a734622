/** What waits for each person on their bench (the home page), by role. */
import { sql } from 'kysely';
import { db } from './db';
import type { Role } from './db/types';
import { episodeBenchFor } from './episode-bench';

export interface BenchItem {
	title: string;
	detail: string;
	href: string;
	tone: 'todo' | 'warn' | 'info';
}

/** With a person id, episode items are those assigned to that person (or to nobody yet). */
export async function benchFor(channelId: string, roles: Role[], personId?: string): Promise<Record<string, BenchItem[]>> {
	const sections: Record<string, BenchItem[]> = {};
	const episodeWork = await episodeBenchFor(channelId, roles, personId);
	if (roles.includes('producer')) {
		const [waiting, disabled, stuckMail] = await Promise.all([
			db
				.selectFrom('membership')
				.innerJoin('person', 'person.id', 'membership.personId')
				.select(['person.name', 'person.email'])
				.where('membership.channelId', '=', channelId)
				.where('membership.disabledAt', 'is', null)
				.where('person.passwordHash', 'is', null)
				.execute(),
			db
				.selectFrom('membership')
				.select((eb) => eb.fn.countAll<number>().as('count'))
				.where('channelId', '=', channelId)
				.where('disabledAt', 'is not', null)
				.executeTakeFirstOrThrow(),
			db
				.selectFrom('outbox')
				.select((eb) => eb.fn.countAll<number>().as('count'))
				.where('channelId', '=', channelId)
				.where('sentAt', 'is', null)
				.where('createdAt', '<', sql<Date>`now() - interval '10 minutes'`)
				.executeTakeFirstOrThrow()
		]);
		sections.producer = [
			...waiting.map((p) => ({ title: `${p.name} hasn't accepted the invite`, detail: `${p.email}: the invite link is valid for 7 days.`, href: '/crew', tone: 'todo' as const })),
			...(disabled.count > 0 ? [{ title: `${disabled.count} disabled account${disabled.count === 1 ? '' : 's'}`, detail: 'They cannot sign in to this channel.', href: '/crew', tone: 'info' as const }] : []),
			...(stuckMail.count > 0 ? [{ title: `${stuckMail.count} e-mail${stuckMail.count === 1 ? '' : 's'} not delivered yet`, detail: 'The mail server is not answering; Wrenchroll keeps retrying.', href: '/channel', tone: 'warn' as const }] : [])
		];
	}
	for (const [role, items] of Object.entries(episodeWork)) {
		if (items.length) sections[role] = [...(sections[role] ?? []), ...items];
	}
	return sections;
}
