/** Footage and uploaded cuts of an episode: listing, the file behind a row, and deleting both together. */
import { access, rm, unlink } from 'node:fs/promises';
import path from 'node:path';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { uploadDir } from './tus-server';
import { storeOf } from './object-store';
import { storageKeyFor } from '../media/makers';
import { MEDIA_KINDS } from '$lib/media';
import type { StoredFile } from '../http/object-response';

export const FOOTAGE_SORTS = ['created', 'clip', 'camera', 'size', 'duration'] as const;
export type FootageSort = (typeof FOOTAGE_SORTS)[number];

const sortColumn = {
	created: 'footage.createdAt',
	clip: 'footage.clipName',
	camera: 'footage.cameraLabel',
	size: 'footage.sizeBytes',
	duration: 'footage.durationSeconds'
} as const;

export async function listFootage(
	channelId: string,
	episodeId: string,
	options: {
		shootDayId?: string;
		camera?: string;
		purpose?: 'footage' | 'cut';
		sort?: FootageSort;
		direction?: 'asc' | 'desc';
	} = {}
) {
	if (!isUuid(episodeId)) throw notFound('That episode');
	const episode = await db
		.selectFrom('episode')
		.select(['id', 'title', 'slug', 'frameRate', 'timecodeDropFrame', 'timecodeStart'])
		.where('id', '=', episodeId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!episode) throw notFound('That episode');
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
		.orderBy(sortColumn[options.sort ?? 'created'], options.direction ?? 'desc')
		.orderBy('footage.id')
		.execute();
	// Whether the file behind each row is on this server, so the page offers Play and Download only
	// where they can work (the demo's rows, or a file removed from disk, have none). A clip moved to
	// the bucket was there when it was recorded; no request to the store per row.
	const footage = await Promise.all(
		rows.map(async ({ uploadId, storedIn, ...row }) => ({
			...row,
			onDisk:
				storedIn === 'bucket' ||
				(await access(path.join(uploadDir(), uploadId)).then(
					() => true,
					() => false
				))
		}))
	);
	return { episode, footage };
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
