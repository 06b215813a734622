/**
 * What a shoot day lists: the crew called, the builds and segments on set, cameras, gear and the
 * pull list (parts needed on set, filled from the day's segments on request).
 */
import { sql } from 'kysely';
import type { z } from 'zod';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { dayInChannel } from './shoot-days';
import type { cameraSchema, gearSchema, pullItemSchema } from '$lib/schemas/shoot';

type DayList = 'crew' | 'builds' | 'segments';

/** What a list's refusal says when an id is not one the day may list. */
const UNKNOWN_IN_LIST: Record<DayList, [message: string, fix: string]> = {
	crew: ['Someone in that list is not on this channel’s crew.', 'Pick people from the crew list.'],
	builds: ['A build in that list is not this channel’s.', 'Pick builds from the list.'],
	segments: ['A segment in that list is not in this episode.', 'Pick segments of this episode.']
};

const LIST_TABLE = {
	crew: 'shootDayCrew',
	builds: 'shootDayBuild',
	segments: 'shootDaySegment'
} as const;

/** How many of `ids` the list may hold: active crew and builds of the channel, segments of the day's episode. */
async function countListable(
	trx: typeof db,
	list: DayList,
	channelId: string,
	episodeId: string,
	ids: string[]
): Promise<number> {
	if (ids.length === 0) return 0;
	if (list === 'crew') {
		const people = await trx
			.selectFrom('membership')
			.select('personId')
			.where('channelId', '=', channelId)
			.where('personId', 'in', ids)
			.where('disabledAt', 'is', null)
			.execute();
		return people.length;
	}
	if (list === 'builds') {
		const builds = await trx
			.selectFrom('build')
			.select('id')
			.where('channelId', '=', channelId)
			.where('id', 'in', ids)
			.execute();
		return builds.length;
	}
	const segments = await trx
		.selectFrom('segment')
		.select('id')
		.where('episodeId', '=', episodeId)
		.where('id', 'in', ids)
		.execute();
	return segments.length;
}

/** Replaces one of the day's lists (crew called, builds on set, segments filmed), checking every id is this channel's. */
export async function setDayMembers(
	channelId: string,
	shootDayId: string,
	list: DayList,
	ids: string[]
) {
	const day = await dayInChannel(channelId, shootDayId);
	const unique = [...new Set(ids)];
	await db.transaction().execute(async (trx) => {
		if ((await countListable(trx, list, channelId, day.episodeId, unique)) !== unique.length) {
			const [message, fix] = UNKNOWN_IN_LIST[list];
			throw new DomainError(400, message, { [list]: [fix] });
		}
		await trx.deleteFrom(LIST_TABLE[list]).where('shootDayId', '=', shootDayId).execute();
		if (unique.length === 0) return;
		if (list === 'crew')
			await trx
				.insertInto('shootDayCrew')
				.values(unique.map((personId) => ({ shootDayId, personId })))
				.execute();
		else if (list === 'builds')
			await trx
				.insertInto('shootDayBuild')
				.values(unique.map((buildId) => ({ shootDayId, buildId })))
				.execute();
		else
			await trx
				.insertInto('shootDaySegment')
				.values(unique.map((segmentId) => ({ shootDayId, segmentId })))
				.execute();
	});
}

export async function addCamera(
	channelId: string,
	shootDayId: string,
	input: z.infer<typeof cameraSchema>
) {
	await dayInChannel(channelId, shootDayId);
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
	await dayInChannel(channelId, shootDayId);
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
	await dayInChannel(channelId, shootDayId);
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

/**
 * Fills the pull list from the segments filmed that day: every part linked on their notes, and
 * every catalogue SKU named in their scripts. Parts already on the list are left as they are.
 */
export async function pullPartsFromSegments(
	channelId: string,
	shootDayId: string
): Promise<{ added: number }> {
	await dayInChannel(channelId, shootDayId);
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
