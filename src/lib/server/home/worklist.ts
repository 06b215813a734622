/** What waits for each person on their bench (the home page), by role. */
import { sql } from 'kysely';
import { db } from '../db';
import type { Role } from '../db/types';
import { episodeWorklistFor } from './episode-worklist';
import { dateFormat } from '$lib/date-format';

export interface WorkItem {
	title: string;
	detail: string;
	href: string;
	tone: 'todo' | 'warn' | 'info';
}

/** With a person id, episode items are those assigned to that person (or to nobody yet). */
export async function worklistFor(
	channelId: string,
	roles: Role[],
	personId?: string
): Promise<Record<string, WorkItem[]>> {
	const sections: Record<string, WorkItem[]> = {};
	const episodeWork = await episodeWorklistFor(channelId, roles, personId);
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
			...waiting.map((p) => ({
				title: `${p.name} hasn't accepted the invite`,
				detail: `${p.email}: the invite link is valid for 7 days.`,
				href: '/crew',
				tone: 'todo' as const
			})),
			...(disabled.count > 0
				? [
						{
							title: `${disabled.count} disabled account${disabled.count === 1 ? '' : 's'}`,
							detail: 'They cannot sign in to this channel.',
							href: '/crew',
							tone: 'info' as const
						}
					]
				: []),
			...(stuckMail.count > 0
				? [
						{
							title: `${stuckMail.count} e-mail${stuckMail.count === 1 ? '' : 's'} not delivered yet`,
							detail: 'The mail server is not answering; Wrenchroll keeps retrying.',
							href: '/channel',
							tone: 'warn' as const
						}
					]
				: [])
		];
	}
	const [schedule, pull, parts, shoots] = await Promise.all([
		roles.includes('producer') ? publishingSoon(channelId) : [],
		roles.includes('merch') ? pullListToCheck(channelId) : [],
		roles.includes('merch') ? partsToReplace(channelId) : [],
		roles.includes('camera') ? nextShootDays(channelId) : []
	]);
	if (schedule.length) sections.producer = [...(sections.producer ?? []), ...schedule];
	if (pull.length || parts.length) sections.merch = [...pull, ...parts];
	if (shoots.length) sections.camera = [...shoots];
	for (const [role, items] of Object.entries(episodeWork)) {
		if (items.length) sections[role] = [...(sections[role] ?? []), ...items];
	}
	return sections;
}

const dayName = (date: string) =>
	dateFormat({
		weekday: 'short',
		day: 'numeric',
		month: 'short',
		timeZone: 'UTC'
	}).format(new Date(date + 'T00:00:00Z'));
const daysUntil = (date: string) =>
	Math.round(
		(Date.parse(date + 'T00:00:00Z') -
			Date.parse(new Date().toISOString().slice(0, 10) + 'T00:00:00Z')) /
			86_400_000
	);

/** Episodes due to publish within three weeks that are not at picture lock yet. */
async function publishingSoon(channelId: string): Promise<WorkItem[]> {
	const rows = await db
		.selectFrom('episode')
		.select(['id', 'title', 'stage', 'publishDate'])
		.where('channelId', '=', channelId)
		.where('stage', 'in', ['script', 'shoot', 'edit'])
		.where('publishDate', 'is not', null)
		.where('publishDate', '<=', sql<string>`current_date + 21`)
		.orderBy('publishDate')
		.execute();
	return rows.map((e) => {
		const days = daysUntil(e.publishDate!);
		return {
			title: `${e.title}: publishes ${days < 0 ? `${-days} days late` : days === 0 ? 'today' : `in ${days} day${days === 1 ? '' : 's'}`}`,
			detail: `Still at the ${e.stage} stage (planned for ${dayName(e.publishDate!)}).`,
			href: `/episodes/${e.id}`,
			tone: days <= 7 ? ('warn' as const) : ('info' as const)
		};
	});
}

/** Pull-list items not yet on hand for shoot days from today on. */
async function pullListToCheck(channelId: string): Promise<WorkItem[]> {
	const rows = await db
		.selectFrom('pullItem')
		.innerJoin('shootDay', 'shootDay.id', 'pullItem.shootDayId')
		.innerJoin('episode', 'episode.id', 'shootDay.episodeId')
		.select([
			'shootDay.id',
			'shootDay.shootDate',
			'episode.title',
			(eb) => eb.fn.countAll<number>().as('missing')
		])
		.where('shootDay.channelId', '=', channelId)
		.where('shootDay.shootDate', '>=', sql<string>`current_date`)
		.where('pullItem.onHand', '=', false)
		.groupBy(['shootDay.id', 'shootDay.shootDate', 'episode.title'])
		.orderBy('shootDay.shootDate')
		.execute();
	return rows.map((d) => ({
		title: `${d.missing} pull-list item${d.missing === 1 ? '' : 's'} to check for ${dayName(d.shootDate)}`,
		detail: `${d.title}: tick each part as on hand before the shoot.`,
		href: `/shoots/${d.id}`,
		tone: 'todo' as const
	}));
}

/** Parts linked in episodes not yet published that are discontinued or out of stock. */
async function partsToReplace(channelId: string): Promise<WorkItem[]> {
	const rows = await db
		.selectFrom('segmentNotePart')
		.innerJoin('segmentNote', 'segmentNote.id', 'segmentNotePart.noteId')
		.innerJoin('episode', 'episode.id', 'segmentNote.episodeId')
		.innerJoin('part', 'part.id', 'segmentNotePart.partId')
		.select(['episode.id', 'episode.title', 'part.sku', 'part.status'])
		.distinct()
		.where('episode.channelId', '=', channelId)
		.where('episode.stage', '!=', 'published')
		.where('part.status', '!=', 'active')
		.execute();
	return rows.map((r) => ({
		title: `${r.sku} is ${r.status === 'out_of_stock' ? 'out of stock' : 'discontinued'}`,
		detail: `It is linked in ${r.title}: link a replacement before picture lock.`,
		href: `/episodes/${r.id}/parts`,
		tone: 'warn' as const
	}));
}

/** The next shoot days, with their call time. */
async function nextShootDays(channelId: string): Promise<WorkItem[]> {
	const rows = await db
		.selectFrom('shootDay')
		.innerJoin('episode', 'episode.id', 'shootDay.episodeId')
		.select([
			'shootDay.id',
			'shootDay.shootDate',
			'shootDay.callTime',
			'shootDay.bay',
			'shootDay.locationName',
			'episode.title'
		])
		.where('shootDay.channelId', '=', channelId)
		.where('shootDay.shootDate', '>=', sql<string>`current_date`)
		.orderBy('shootDay.shootDate')
		.limit(3)
		.execute();
	return rows.map((d) => ({
		title: `Shoot ${dayName(d.shootDate)}, call ${d.callTime.slice(0, 5)}`,
		detail: `${d.title} · ${d.bay || d.locationName}. Check cards and the call sheet.`,
		href: `/shoots/${d.id}`,
		tone: 'info' as const
	}));
}
