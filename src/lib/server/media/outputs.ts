/** What the crew sees of the media outputs: their state per clip, the files, and trying again. */
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import type { StoredFile } from '../http/object-response';
import { OUTPUT_TYPES } from './makers';
import type { MediaKind, MediaState } from '$lib/media';
import { requeueOutputs } from './queue';

export interface MediaOutputView {
	kind: MediaKind;
	state: MediaState;
	progress: number;
	message: string | null;
	details: unknown;
	bytes: number | null;
}

/** The outputs of each clip (by footage id), in MEDIA_KINDS order; channel-scoped. */
export async function mediaOutputsFor(
	channelId: string,
	footageIds: readonly string[]
): Promise<Record<string, MediaOutputView[]>> {
	const byClip: Record<string, MediaOutputView[]> = {};
	if (footageIds.length === 0) return byClip;
	const rows = await db
		.selectFrom('mediaOutput')
		.innerJoin('footage', 'footage.id', 'mediaOutput.footageId')
		.select([
			'mediaOutput.footageId',
			'mediaOutput.kind',
			'mediaOutput.state',
			'mediaOutput.progress',
			'mediaOutput.message',
			'mediaOutput.details',
			'mediaOutput.bytes'
		])
		.where('footage.channelId', '=', channelId)
		.where('mediaOutput.footageId', 'in', footageIds)
		.execute();
	const order = { proxy: 0, poster: 1, sprite: 2, peaks: 3 } as const;
	for (const { footageId, ...row } of rows) (byClip[footageId] ??= []).push(row);
	for (const list of Object.values(byClip)) list.sort((a, b) => order[a.kind] - order[b.kind]);
	return byClip;
}

/** The file of a finished output: 404 for another channel's clip, or one not made (yet). */
export async function mediaFile(channelId: string, footageId: string, kind: MediaKind) {
	if (!isUuid(footageId)) throw notFound('That clip');
	const row = await db
		.selectFrom('mediaOutput')
		.innerJoin('footage', 'footage.id', 'mediaOutput.footageId')
		.select(['mediaOutput.state', 'mediaOutput.storageKey', 'footage.clipName', 'footage.storedIn'])
		.where('footage.channelId', '=', channelId)
		.where('footage.id', '=', footageId)
		.where('mediaOutput.kind', '=', kind)
		.executeTakeFirst();
	if (!row) throw notFound('That clip');
	if (row.state !== 'done' || !row.storageKey)
		throw new DomainError(404, `This clip's ${kind} is not made yet (${row.state}).`);
	const stored: StoredFile = {
		storedIn: row.storedIn,
		key: row.storageKey,
		missing: `This clip's ${kind} is no longer on the server.`
	};
	return {
		stored,
		type: OUTPUT_TYPES[kind],
		clipName: row.clipName,
		extension: row.storageKey.slice(row.storageKey.lastIndexOf('.'))
	};
}

/** Queues the clip's failed outputs again; 404 for another channel's clip. */
export async function retryOutputs(channelId: string, footageId: string): Promise<number> {
	if (!isUuid(footageId)) throw notFound('That clip');
	const clip = await db
		.selectFrom('footage')
		.select(['id', 'durationSeconds'])
		.where('id', '=', footageId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!clip) throw notFound('That clip');
	return requeueOutputs(clip.id, clip.durationSeconds);
}
