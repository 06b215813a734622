/** Shoot days: where and when the crew films, who is called, what is on set, and the pull list. */
import { sql } from 'kysely';
import type { z } from 'zod';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { activeCrew } from '../channel/crew';
import type {
	cameraSchema,
	gearSchema,
	plannerSchema,
	profileSchema,
	pullItemSchema,
	shootDaySchema,
	shootDayUpdateSchema
} from '$lib/schemas/shoot';

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

async function dayInChannel(executor: typeof db, channelId: string, shootDayId: string) {
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
	await dayInChannel(db, channelId, shootDayId);
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
	await dayInChannel(db, channelId, shootDayId);
	await db.updateTable('shootDay').set(input).where('id', '=', shootDayId).execute();
}

export async function deleteShootDay(channelId: string, shootDayId: string) {
	await dayInChannel(db, channelId, shootDayId);
	await db.deleteFrom('shootDay').where('id', '=', shootDayId).execute();
}

/** Replaces one of the day's lists (crew called, builds on set, segments filmed), checking every id is this channel's. */
export async function setDayMembers(
	channelId: string,
	shootDayId: string,
	list: 'crew' | 'builds' | 'segments',
	ids: string[]
) {
	const day = await dayInChannel(db, channelId, shootDayId);
	const unique = [...new Set(ids)];
	await db.transaction().execute(async (trx) => {
		if (list === 'crew') {
			const valid = unique.length
				? await trx
						.selectFrom('membership')
						.select('personId')
						.where('channelId', '=', channelId)
						.where('personId', 'in', unique)
						.where('disabledAt', 'is', null)
						.execute()
				: [];
			if (valid.length !== unique.length)
				throw new DomainError(400, 'Someone in that list is not on this channel’s crew.', {
					crew: ['Pick people from the crew list.']
				});
			await trx.deleteFrom('shootDayCrew').where('shootDayId', '=', shootDayId).execute();
			if (unique.length)
				await trx
					.insertInto('shootDayCrew')
					.values(unique.map((personId) => ({ shootDayId, personId })))
					.execute();
		} else if (list === 'builds') {
			const valid = unique.length
				? await trx
						.selectFrom('build')
						.select('id')
						.where('channelId', '=', channelId)
						.where('id', 'in', unique)
						.execute()
				: [];
			if (valid.length !== unique.length)
				throw new DomainError(400, 'A build in that list is not this channel’s.', {
					builds: ['Pick builds from the list.']
				});
			await trx.deleteFrom('shootDayBuild').where('shootDayId', '=', shootDayId).execute();
			if (unique.length)
				await trx
					.insertInto('shootDayBuild')
					.values(unique.map((buildId) => ({ shootDayId, buildId })))
					.execute();
		} else {
			const valid = unique.length
				? await trx
						.selectFrom('segment')
						.select('id')
						.where('episodeId', '=', day.episodeId)
						.where('id', 'in', unique)
						.execute()
				: [];
			if (valid.length !== unique.length)
				throw new DomainError(400, 'A segment in that list is not in this episode.', {
					segments: ['Pick segments of this episode.']
				});
			await trx.deleteFrom('shootDaySegment').where('shootDayId', '=', shootDayId).execute();
			if (unique.length)
				await trx
					.insertInto('shootDaySegment')
					.values(unique.map((segmentId) => ({ shootDayId, segmentId })))
					.execute();
		}
	});
}

export async function addCamera(
	channelId: string,
	shootDayId: string,
	input: z.infer<typeof cameraSchema>
) {
	await dayInChannel(db, channelId, shootDayId);
	const profile = await db
		.selectFrom('recordingProfile')
		.select('id')
		.where('id', '=', input.profileId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!profile)
		throw new DomainError(400, 'Pick one of this channel’s recording profiles.', {
			profileId: ['Pick a recording profile.']
		});
	return db
		.insertInto('shootDayCamera')
		.values({ shootDayId, ...input })
		.returning('id')
		.executeTakeFirstOrThrow();
}

export async function addGear(
	channelId: string,
	shootDayId: string,
	input: z.infer<typeof gearSchema>
) {
	await dayInChannel(db, channelId, shootDayId);
	return db
		.insertInto('gearItem')
		.values({ shootDayId, ...input })
		.returning('id')
		.executeTakeFirstOrThrow();
}

export async function addPullItem(
	channelId: string,
	shootDayId: string,
	input: z.infer<typeof pullItemSchema>,
	source: 'segment' | 'extra' = 'extra'
) {
	await dayInChannel(db, channelId, shootDayId);
	let label = input.label;
	if (input.partId) {
		const part = await db
			.selectFrom('part')
			.select(['name', 'sku'])
			.where('id', '=', input.partId)
			.where('channelId', '=', channelId)
			.executeTakeFirst();
		if (!part)
			throw new DomainError(400, 'That part is not in this channel’s catalogue.', {
				partId: ['Pick a part from the catalogue.']
			});
		label ||= part.name;
	}
	return db
		.insertInto('pullItem')
		.values({ shootDayId, partId: input.partId, label, quantity: input.quantity, source })
		.returning('id')
		.executeTakeFirstOrThrow();
}

/** The merch team ticks a pull item as on hand before the day; who and when are kept. */
export async function setPullOnHand(
	channelId: string,
	itemId: string,
	personId: string,
	onHand: boolean,
	version: number
) {
	if (!isUuid(itemId)) throw notFound('That pull-list item');
	const item = await db
		.selectFrom('pullItem')
		.innerJoin('shootDay', 'shootDay.id', 'pullItem.shootDayId')
		.select(['pullItem.id'])
		.where('pullItem.id', '=', itemId)
		.where('shootDay.channelId', '=', channelId)
		.executeTakeFirst();
	if (!item) throw notFound('That pull-list item');
	const updated = await db
		.updateTable('pullItem')
		.set((eb) => ({
			onHand,
			checkedBy: onHand ? personId : null,
			checkedAt: onHand ? new Date() : null,
			version: eb('version', '+', 1)
		}))
		.where('id', '=', itemId)
		.where('version', '=', version)
		.returning(['id', 'onHand', 'version'])
		.executeTakeFirst();
	if (!updated) {
		const current = await db
			.selectFrom('pullItem')
			.selectAll()
			.where('id', '=', itemId)
			.executeTakeFirstOrThrow();
		throw new DomainError(
			409,
			'Someone else ticked this item meanwhile; the list now shows their answer.',
			undefined,
			{ current }
		);
	}
	return updated;
}

/** Removes a camera, gear or pull item of a day in this channel. */
export async function removeDayItem(
	channelId: string,
	kind: 'camera' | 'gear' | 'pull',
	itemId: string
) {
	if (!isUuid(itemId)) throw notFound('That item');
	const table = kind === 'camera' ? 'shootDayCamera' : kind === 'gear' ? 'gearItem' : 'pullItem';
	const result = await db
		.deleteFrom(table)
		.where('id', '=', itemId)
		.where(
			'shootDayId',
			'in',
			db.selectFrom('shootDay').select('id').where('channelId', '=', channelId)
		)
		.executeTakeFirst();
	if (Number(result.numDeletedRows) === 0) throw notFound('That item');
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

export async function listProfiles(channelId: string) {
	return db
		.selectFrom('recordingProfile')
		.selectAll()
		.where('channelId', '=', channelId)
		.orderBy('name')
		.execute();
}

export async function createProfile(channelId: string, input: z.infer<typeof profileSchema>) {
	return db
		.insertInto('recordingProfile')
		.values({ channelId, ...input })
		.returningAll()
		.executeTakeFirstOrThrow();
}

export async function deleteProfile(channelId: string, profileId: string) {
	if (!isUuid(profileId)) throw notFound('That recording profile');
	const profile = await db
		.selectFrom('recordingProfile')
		.select('id')
		.where('id', '=', profileId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!profile) throw notFound('That recording profile');
	const inUse = await db
		.selectFrom('shootDayCamera')
		.select('id')
		.where('profileId', '=', profileId)
		.executeTakeFirst();
	if (inUse) throw new DomainError(409, 'A shoot day uses this profile: change that camera first.');
	const result = await db
		.deleteFrom('recordingProfile')
		.where('id', '=', profileId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (Number(result.numDeletedRows) === 0) throw notFound('That recording profile');
}

/**
 * Fills the pull list from the segments filmed that day: every part linked on their notes, and
 * every catalogue SKU named in their scripts. Parts already on the list are left as they are.
 */
export async function pullPartsFromSegments(
	channelId: string,
	shootDayId: string
): Promise<{ added: number }> {
	await dayInChannel(db, channelId, shootDayId);
	return db.transaction().execute(async (trx) => {
		const linked = await trx
			.selectFrom('shootDaySegment')
			.innerJoin('segmentNote', 'segmentNote.segmentId', 'shootDaySegment.segmentId')
			.innerJoin('segmentNotePart', 'segmentNotePart.noteId', 'segmentNote.id')
			.select('segmentNotePart.partId')
			.where('shootDaySegment.shootDayId', '=', shootDayId)
			.execute();
		// A SKU named in the script, as a whole word (SKUs are letters, digits and dashes).
		const named = await trx
			.selectFrom('shootDaySegment')
			.innerJoin('segmentScript', 'segmentScript.segmentId', 'shootDaySegment.segmentId')
			.innerJoin('part', (join) =>
				join
					.on('part.channelId', '=', channelId)
					.on(
						sql<boolean>`segment_script.body ~* ('(^|[^A-Za-z0-9-])' || regexp_replace(part.sku, '([^A-Za-z0-9])', '\\\\\\1', 'g') || '($|[^A-Za-z0-9-])')`
					)
			)
			.select('part.id as partId')
			.where('shootDaySegment.shootDayId', '=', shootDayId)
			.execute();
		const wanted = [...new Set([...linked, ...named].map((row) => row.partId))];
		const present = new Set(
			(
				await trx
					.selectFrom('pullItem')
					.select('partId')
					.where('shootDayId', '=', shootDayId)
					.where('partId', 'is not', null)
					.execute()
			).map((row) => row.partId)
		);
		const missing = wanted.filter((id) => !present.has(id));
		if (missing.length === 0) return { added: 0 };
		const parts = await trx
			.selectFrom('part')
			.select(['id', 'name'])
			.where('id', 'in', missing)
			.execute();
		await trx
			.insertInto('pullItem')
			.values(
				parts.map((part) => ({
					shootDayId,
					partId: part.id,
					label: part.name,
					quantity: 1,
					source: 'segment' as const
				}))
			)
			.execute();
		return { added: parts.length };
	});
}
