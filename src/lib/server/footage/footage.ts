/** Footage and uploaded cuts of an episode: listing, the file behind a row, and deleting both together. */
import { access, rm, unlink } from 'node:fs/promises';
import path from 'node:path';
import { sql } from 'kysely';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import {
	keysetAfter,
	keysetOrderBy,
	keysetPage,
	keysetSelections,
	type SortKey
} from '../http/keyset';
import { DEFAULT_PAGE_SIZE, type Cursor } from '$lib/schemas/paging';
import type { FootageSort } from '$lib/schemas/footage-list';
import { uploadDir } from './tus-server';
import { storeOf } from './object-store';
import { storageKeyFor } from '../media/makers';
import { MEDIA_KINDS } from '$lib/media';
import type { StoredFile } from '../http/object-response';

export { FOOTAGE_SORTS, type FootageSort } from '$lib/schemas/footage-list';

/** Each sort's key: a non-null expression (a clip without a measured length sorts as -1 s). */
const sortKey: Record<FootageSort, Omit<SortKey, 'direction'>> = {
	created: { expression: sql`footage.created_at`, kind: 'timestamp' },
	clip: { expression: sql`footage.clip_name`, kind: 'text' },
	camera: { expression: sql`footage.camera_label`, kind: 'text' },
	size: { expression: sql`footage.size_bytes`, kind: 'integer' },
	duration: { expression: sql`coalesce(footage.duration_seconds, -1)`, kind: 'float' }
};

/**
 * The list's order: the chosen column, then the id in the same direction, so rows that tie keep
 * one order across pages and an index on (episode, column, id) reads either way.
 */
function footageOrder(sort: FootageSort, direction: 'asc' | 'desc'): SortKey[] {
	return [
		{ ...sortKey[sort], direction },
		{ expression: sql`footage.id`, direction, kind: 'uuid' }
	];
}

export interface FootageListOptions {
	shootDayId?: string;
	camera?: string;
	purpose?: 'footage' | 'cut';
	sort?: FootageSort;
	direction?: 'asc' | 'desc';
	/** The previous page's `next`, decoded. */
	after?: Cursor;
	limit?: number;
}

/**
 * One page of an episode's footage and cuts (keyset-paged: `after` is the previous page's `next`),
 * newest first unless sorted otherwise; with the episode's totals and camera names, read with the
 * episode row, so filters and headings see the whole list.
 */
export async function listFootage(
	channelId: string,
	episodeId: string,
	options: FootageListOptions = {}
) {
	if (!isUuid(episodeId)) throw notFound('That episode');
	const found = await db
		.selectFrom('episode')
		.select((eb) => [
			'id',
			'title',
			'slug',
			'frameRate',
			'timecodeDropFrame',
			'timecodeStart',
			eb
				.selectFrom('footage')
				.select((inner) => inner.fn.countAll<string>().as('files'))
				.whereRef('footage.episodeId', '=', 'episode.id')
				.as('fileCount'),
			eb
				.selectFrom('footage')
				.select(sql<string>`coalesce(sum(footage.size_bytes), 0)`.as('bytes'))
				.whereRef('footage.episodeId', '=', 'episode.id')
				.as('totalBytes'),
			eb
				.selectFrom('footage')
				.select(
					sql<
						string[]
					>`coalesce(array_agg(DISTINCT footage.camera_label ORDER BY footage.camera_label) FILTER (WHERE footage.camera_label <> ''), '{}')`.as(
						'labels'
					)
				)
				.whereRef('footage.episodeId', '=', 'episode.id')
				.as('cameras')
		])
		.where('id', '=', episodeId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!found) throw notFound('That episode');
	const { fileCount, totalBytes, cameras, ...episode } = found;
	const sort = options.sort ?? 'created';
	const direction = options.direction ?? (sort === 'created' || sort === 'size' ? 'desc' : 'asc');
	const order = `${sort}:${direction}`;
	const keys = footageOrder(sort, direction);
	const limit = options.limit ?? DEFAULT_PAGE_SIZE;
	let query = db
		.selectFrom('footage')
		.leftJoin('shootDay', 'shootDay.id', 'footage.shootDayId')
		.leftJoin('person', 'person.id', 'footage.uploadedBy')
		.select([
			'footage.id',
			'footage.uploadId',
			'footage.purpose',
			'footage.clipName',
			'footage.fileName',
			'footage.fileType',
			'footage.cameraLabel',
			'footage.sizeBytes',
			'footage.sha256',
			'footage.durationSeconds',
			'footage.frameRate',
			'footage.videoCodec',
			'footage.probeNote',
			'footage.videoProfile',
			'footage.variableFrameRate',
			'footage.width',
			'footage.height',
			'footage.startTimecode',
			'footage.audioChannels',
			'footage.createdAt',
			'footage.storedIn',
			'footage.shootDayId',
			'shootDay.shootDate',
			'person.name as uploadedByName'
		])
		.where('footage.channelId', '=', channelId)
		.where('footage.episodeId', '=', episodeId);
	if (options.shootDayId && isUuid(options.shootDayId))
		query = query.where('footage.shootDayId', '=', options.shootDayId);
	if (options.camera) query = query.where('footage.cameraLabel', '=', options.camera);
	if (options.purpose) query = query.where('footage.purpose', '=', options.purpose);
	const rows = await query
		.select(keysetSelections(keys))
		.where(keysetAfter(order, keys, options.after))
		.orderBy(keysetOrderBy(keys))
		.limit(limit + 1)
		.execute();
	const page = keysetPage(order, keys, rows, limit);
	// Whether the file behind each row is on this server, so the page offers Play and Download only
	// where they can work (the demo's rows, or a file removed from disk, have none). A clip moved to
	// the bucket was there when it was recorded; no request to the store per row.
	const footage = await Promise.all(
		page.items.map(async ({ uploadId, storedIn, ...row }) => ({
			...row,
			onDisk:
				storedIn === 'bucket' ||
				(await access(path.join(uploadDir(), uploadId)).then(
					() => true,
					() => false
				))
		}))
	);
	return {
		episode,
		totals: {
			files: Number(fileCount ?? 0),
			bytes: Number(totalBytes ?? 0),
			cameras: cameras ?? []
		},
		sort,
		direction,
		footage,
		next: page.next
	};
}

export async function footageFile(channelId: string, footageId: string) {
	if (!isUuid(footageId)) throw notFound('That clip');
	const row = await db
		.selectFrom('footage')
		.select(['id', 'uploadId', 'fileName', 'fileType', 'sizeBytes', 'storedIn'])
		.where('id', '=', footageId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!row) throw notFound('That clip');
	const stored: StoredFile = {
		storedIn: row.storedIn,
		key: row.uploadId,
		missing: 'The file behind this clip is not on the server (demo data, or removed from disk).'
	};
	return { ...row, stored, path: path.join(uploadDir(), row.uploadId) };
}

/** Deletes the row and its files in one go: if the clip's file cannot be removed, the row stays. */
export async function deleteFootage(channelId: string, footageId: string): Promise<void> {
	const file = await footageFile(channelId, footageId);
	await db.transaction().execute(async (trx) => {
		await trx
			.deleteFrom('footage')
			.where('id', '=', file.id)
			.where('channelId', '=', channelId)
			.execute();
		await trx.deleteFrom('upload').where('id', '=', file.uploadId).execute();
		if (file.storedIn === 'bucket') {
			// The clip and everything made from it, in one request to the store.
			try {
				await storeOf('bucket').remove([
					file.uploadId,
					...MEDIA_KINDS.map((kind) => storageKeyFor(file.id, kind))
				]);
			} catch {
				throw new DomainError(
					409,
					'The file could not be removed from object storage; nothing was deleted. Try again.'
				);
			}
			return;
		}
		try {
			await unlink(file.path);
		} catch (failure) {
			if ((failure as NodeJS.ErrnoException).code !== 'ENOENT')
				throw new DomainError(
					409,
					'The file could not be removed from disk; nothing was deleted. Try again.'
				);
		}
		await unlink(file.path + '.json').catch(() => undefined);
		// The proxy, poster, thumbnails and waveform made from it (media_output rows go with the row).
		await rm(path.join(uploadDir(), 'derived', file.id), { recursive: true, force: true });
	});
}
