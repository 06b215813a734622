/**
 * Shoot days: where and when the crew films, and everything one day's page shows. What a day
 * lists (crew called, builds and segments on set, cameras, gear, pull list) is changed in
 * day-items.ts; the channel's recording profiles are in recording-profiles.ts.
 */
import { sql } from 'kysely';
import type { z } from 'zod';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { activeCrew } from '../channel/crew';
import type { plannerSchema, shootDaySchema, shootDayUpdateSchema } from '$lib/schemas/shoot';

const dayFormat = new Intl.DateTimeFormat('en', {
	weekday: 'short',
	day: 'numeric',
	month: 'short',
	timeZone: 'UTC'
});
export const shootDayLabel = (day: { shootDate: string; bay: string; locationName: string }) =>
	`${dayFormat.format(new Date(day.shootDate + 'T00:00:00Z'))} · ${day.bay || day.locationName}`;

/** The shoot days of an episode as select options: "Tue 8 Dec · Bay 3". */
export async function shootDayOptions(channelId: string, episodeId: string) {
	const days = await db
		.selectFrom('shootDay')
		.select(['id', 'shootDate', 'locationName', 'bay'])
		.where('channelId', '=', channelId)
		.where('episodeId', '=', episodeId)
		.orderBy('shootDate')
		.execute();
	return days.map((day) => ({ id: day.id, label: shootDayLabel(day) }));
}

export async function listShootDays(channelId: string) {
	return db
		.selectFrom('shootDay')
		.innerJoin('episode', 'episode.id', 'shootDay.episodeId')
		.select([
			'shootDay.id',
			'shootDay.shootDate',
			'shootDay.locationName',
			'shootDay.bay',
			'shootDay.callTime',
			'shootDay.wrapTime',
			'episode.id as episodeId',
			'episode.title as episodeTitle',
			(eb) =>
				eb
					.selectFrom('shootDayCrew')
					.whereRef('shootDayCrew.shootDayId', '=', 'shootDay.id')
					.select((e) => e.fn.countAll<number>().as('n'))
					.as('crewCount'),
			(eb) =>
				eb
					.selectFrom('pullItem')
					.whereRef('pullItem.shootDayId', '=', 'shootDay.id')
					.select((e) => e.fn.countAll<number>().as('n'))
					.as('pullCount'),
			(eb) =>
				eb
					.selectFrom('pullItem')
					.whereRef('pullItem.shootDayId', '=', 'shootDay.id')
					.where('pullItem.onHand', '=', true)
					.select((e) => e.fn.countAll<number>().as('n'))
					.as('pullOnHand')
		])
		.where('shootDay.channelId', '=', channelId)
		.orderBy('shootDay.shootDate')
		.orderBy('shootDay.callTime')
		.execute();
}

/** The day's row if it is this channel's; 404 otherwise. */
export async function dayInChannel(
	channelId: string,
	shootDayId: string,
	executor: typeof db = db
) {
	if (!isUuid(shootDayId)) throw notFound('That shoot day');
	const day = await executor
		.selectFrom('shootDay')
		.select(['id', 'episodeId', 'version'])
		.where('id', '=', shootDayId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!day) throw notFound('That shoot day');
	return day;
}

/** Creates a day; it films every segment of the episode that needs footage until the crew says otherwise. */
export async function createShootDay(channelId: string, input: z.infer<typeof shootDaySchema>) {
	const episode = await db
		.selectFrom('episode')
		.select('id')
		.where('id', '=', input.episodeId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!episode)
		throw new DomainError(404, 'That episode was not found in this channel.', {
			episodeId: ['Pick an episode of this channel.']
		});
	return db.transaction().execute(async (trx) => {
		const day = await trx
			.insertInto('shootDay')
			.values({ ...input, channelId })
			.returning('id')
			.executeTakeFirstOrThrow();
		const segments = await trx
			.selectFrom('segment')
			.select('id')
			.where('episodeId', '=', input.episodeId)
			.where('needsFootage', '=', true)
			.execute();
		if (segments.length)
			await trx
				.insertInto('shootDaySegment')
				.values(segments.map((s) => ({ shootDayId: day.id, segmentId: s.id })))
				.execute();
		const builds = await trx
			.selectFrom('episodeBuild')
			.select('buildId')
			.where('episodeId', '=', input.episodeId)
			.execute();
		if (builds.length)
			await trx
				.insertInto('shootDayBuild')
				.values(builds.map((b) => ({ shootDayId: day.id, buildId: b.buildId })))
				.execute();
		return day;
	});
}

export async function updateShootDay(
	channelId: string,
	shootDayId: string,
	input: z.infer<typeof shootDayUpdateSchema>
) {
	await dayInChannel(channelId, shootDayId);
	const { version, ...values } = input;
	const updated = await db
		.updateTable('shootDay')
		.set((eb) => ({ ...values, version: eb('version', '+', 1) }))
		.where('id', '=', shootDayId)
		.where('version', '=', version)
		.returningAll()
		.executeTakeFirst();
	if (!updated) {
		const current = await db
			.selectFrom('shootDay')
			.selectAll()
			.where('id', '=', shootDayId)
			.executeTakeFirstOrThrow();
		throw new DomainError(
			409,
			'Someone saved this shoot day while you were editing. Their version is shown; your text is kept in the form.',
			undefined,
			{ current }
		);
	}
	return updated;
}

export async function updatePlanner(
	channelId: string,
	shootDayId: string,
	input: z.infer<typeof plannerSchema>
) {
	await dayInChannel(channelId, shootDayId);
	await db.updateTable('shootDay').set(input).where('id', '=', shootDayId).execute();
}

export async function deleteShootDay(channelId: string, shootDayId: string) {
	await dayInChannel(channelId, shootDayId);
	await db.deleteFrom('shootDay').where('id', '=', shootDayId).execute();
}

/** Everything one shoot day page shows, read in parallel. */
export async function shootDayDetail(channelId: string, shootDayId: string) {
	if (!isUuid(shootDayId)) throw notFound('That shoot day');
	const day = await db
		.selectFrom('shootDay')
		.innerJoin('episode', 'episode.id', 'shootDay.episodeId')
		.selectAll('shootDay')
		.select(['episode.title as episodeTitle', 'episode.slug as episodeSlug', 'episode.frameRate'])
		.where('shootDay.id', '=', shootDayId)
		.where('shootDay.channelId', '=', channelId)
		.executeTakeFirst();
	if (!day) throw notFound('That shoot day');
	const [
		crew,
		crewOptions,
		builds,
		buildOptions,
		cameras,
		profiles,
		gear,
		pull,
		segments,
		allSegments
	] = await Promise.all([
		db
			.selectFrom('shootDayCrew')
			.innerJoin('person', 'person.id', 'shootDayCrew.personId')
			.innerJoin('membership', (join) =>
				join
					.onRef('membership.personId', '=', 'person.id')
					.on('membership.channelId', '=', channelId)
			)
			.select(['person.id', 'person.name', 'person.email', 'membership.roles', 'shootDayCrew.duty'])
			.where('shootDayCrew.shootDayId', '=', shootDayId)
			.orderBy('person.name')
			.execute(),
		activeCrew(channelId),
		db
			.selectFrom('shootDayBuild')
			.innerJoin('build', 'build.id', 'shootDayBuild.buildId')
			.select(['build.id', 'build.name', 'build.year', 'build.vehicleType'])
			.where('shootDayBuild.shootDayId', '=', shootDayId)
			.execute(),
		db
			.selectFrom('build')
			.select(['id', 'name', 'year'])
			.where('channelId', '=', channelId)
			.orderBy('name')
			.execute(),
		db
			.selectFrom('shootDayCamera')
			.innerJoin('recordingProfile', 'recordingProfile.id', 'shootDayCamera.profileId')
			.select([
				'shootDayCamera.id',
				'shootDayCamera.label',
				'shootDayCamera.rollHours',
				'recordingProfile.id as profileId',
				'recordingProfile.name as profileName',
				'recordingProfile.camera',
				'recordingProfile.codec',
				'recordingProfile.resolution',
				'recordingProfile.frameRate',
				'recordingProfile.bitrateMbps'
			])
			.where('shootDayCamera.shootDayId', '=', shootDayId)
			.orderBy('shootDayCamera.label')
			.execute(),
		db
			.selectFrom('recordingProfile')
			.selectAll()
			.where('channelId', '=', channelId)
			.orderBy('name')
			.execute(),
		db
			.selectFrom('gearItem')
			.selectAll()
			.where('shootDayId', '=', shootDayId)
			.orderBy('kind')
			.orderBy('label')
			.execute(),
		db
			.selectFrom('pullItem')
			.leftJoin('part', 'part.id', 'pullItem.partId')
			.leftJoin('person', 'person.id', 'pullItem.checkedBy')
			.select([
				'pullItem.id',
				'pullItem.label',
				'pullItem.quantity',
				'pullItem.source',
				'pullItem.onHand',
				'pullItem.checkedAt',
				'pullItem.version',
				'part.sku',
				'part.status as partStatus',
				'person.name as checkedByName'
			])
			.where('pullItem.shootDayId', '=', shootDayId)
			.orderBy('pullItem.source', 'desc')
			.orderBy('pullItem.label')
			.execute(),
		db
			.selectFrom('shootDaySegment')
			.innerJoin('segment', 'segment.id', 'shootDaySegment.segmentId')
			.select([
				'segment.id',
				'segment.position',
				'segment.title',
				'segment.kind',
				'segment.hazards',
				(eb) =>
					eb
						.selectFrom('caution')
						.whereRef('caution.segmentId', '=', 'segment.id')
						.select(
							sql<
								{ hazard: string; text: string }[]
							>`coalesce(json_agg(json_build_object('hazard', caution.hazard, 'text', caution.text) ORDER BY caution.hazard), '[]')`.as(
								'c'
							)
						)
						.as('cautions'),
				(eb) =>
					eb
						.selectFrom('shot')
						.whereRef('shot.segmentId', '=', 'segment.id')
						.select((e) => e.fn.countAll<number>().as('n'))
						.as('shotCount')
			])
			.where('shootDaySegment.shootDayId', '=', shootDayId)
			.orderBy('segment.position')
			.execute(),
		db
			.selectFrom('segment')
			.select(['id', 'position', 'title', 'needsFootage'])
			.where('episodeId', '=', day.episodeId)
			.orderBy('position')
			.execute()
	]);
	return {
		day,
		crew,
		crewOptions,
		builds,
		buildOptions,
		cameras,
		profiles,
		gear,
		pull,
		segments: segments.map((s) => ({ ...s, cautions: s.cautions ?? [] })),
		allSegments
	};
}
