/**
 * Saving a segment's script. A save names the version the writer started from; a stale one answers
 * 409 with the saved text in `current`, so the page can show both texts for a merge.
 */
import { db } from '../db';
import { DomainError } from '../http/api';
import type { Actor, Executor } from './episodes';
import { hostPaceFor } from './host-pace';
import { segmentInChannel } from './segment-in-channel';
import { episodeOpenFor } from './stage-locks';
import { estimateSpokenSeconds } from '$lib/script/timing';
import { spokenWords } from '$lib/server/episodes/script-reader';

export interface ScriptSaved {
	segmentId: string;
	body: string;
	version: number;
	updatedAt: string;
	updatedByName: string | null;
	words: number;
	spokenSeconds: number;
}

async function currentScript(executor: Executor, segmentId: string) {
	return executor
		.selectFrom('segmentScript')
		.leftJoin('person', 'person.id', 'segmentScript.updatedBy')
		.select([
			'segmentScript.body',
			'segmentScript.version',
			'segmentScript.updatedAt',
			'person.name as updatedByName'
		])
		.where('segmentScript.segmentId', '=', segmentId)
		.executeTakeFirstOrThrow();
}

/**
 * Saves a segment's script if the version is the one the writer started from. A stale version
 * answers 409 with the saved text in `current`, so the page can show both texts for a merge.
 */
export async function saveScript(
	channelId: string,
	actor: Actor,
	segmentId: string,
	input: { body: string; version: number }
): Promise<ScriptSaved> {
	// Counted while the save runs, outside the transaction.
	const wordsOfInput = spokenWords(input.body);
	return db.transaction().execute(async (trx) => {
		await episodeOpenFor(trx, channelId, 'script', { segmentId });
		const segment = await segmentInChannel(trx, channelId, segmentId);
		const updated = await trx
			.updateTable('segmentScript')
			.set((eb) => ({
				body: input.body,
				version: eb('version', '+', 1),
				updatedBy: actor.id,
				updatedAt: new Date()
			}))
			.where('segmentId', '=', segmentId)
			.where('version', '=', input.version)
			.returning(['version', 'updatedAt'])
			.executeTakeFirst();
		const pace = await hostPaceFor(channelId, segment.episodeId, trx);
		if (!updated) {
			const current = await currentScript(trx, segmentId);
			const words = await spokenWords(current.body);
			throw new DomainError(
				409,
				`${current.updatedByName ?? 'Someone'} saved this segment’s script while you were writing. Both versions are shown: merge them, then save again.`,
				undefined,
				{
					current: {
						segmentId,
						body: current.body,
						version: current.version,
						updatedAt: new Date(current.updatedAt).toISOString(),
						updatedByName: current.updatedByName,
						words,
						spokenSeconds: estimateSpokenSeconds(words, pace.wordsPerMinute)
					}
				}
			);
		}
		const words = await wordsOfInput;
		return {
			segmentId,
			body: input.body,
			version: updated.version,
			updatedAt: new Date(updated.updatedAt).toISOString(),
			updatedByName: actor.name,
			words,
			spokenSeconds: estimateSpokenSeconds(words, pace.wordsPerMinute)
		};
	});
}
