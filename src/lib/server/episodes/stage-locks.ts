/**
 * The one guard every write to an episode's work calls (rundown, script, shots, notes, chapters,
 * cards, the cut's length): inside the write's transaction it reads the episode row FOR UPDATE,
 * before any other row is locked, and refuses with 409 and the reason from $lib/stages' stageLock
 * when the episode's stage has fixed that kind of work. Taking the episode lock first, always, means
 * a stage move (which updates the episode row) waits for a write in progress, a write waits for a
 * stage move in progress, and two writes never lock rows in opposite orders.
 */
import { isUuid } from '../auth/identity';
import { DomainError, notFound } from '../http/api';
import { episodeNotFound, type Executor } from './episodes';
import { segmentNotFound } from './segment-in-channel';
import { stageLock, type Lockable, type Stage } from '$lib/stages';

/** Which record the write names: the episode itself, or a segment or note of it. */
export type LockTarget = { episodeId: string } | { segmentId: string } | { noteId: string };

/** 409 with the reason when the stage has fixed this kind of work; otherwise nothing. */
export function refuseIfFixed(stage: string, what: Lockable): void {
	const reason = stageLock(stage as Stage, what);
	if (reason) throw new DomainError(409, reason, undefined, { lock: { what, stage, reason } });
}

/**
 * The episode a write touches, locked FOR UPDATE and checked against the channel (404 otherwise),
 * after checking its stage leaves `what` open (409 with the reason otherwise). Call it first in the
 * transaction.
 */
export async function episodeOpenFor(
	trx: Executor,
	channelId: string,
	what: Lockable,
	target: LockTarget
) {
	const [id, missing] =
		'episodeId' in target
			? [target.episodeId, episodeNotFound]
			: 'segmentId' in target
				? [target.segmentId, segmentNotFound]
				: [target.noteId, () => notFound('That note')];
	if (!isUuid(id)) throw missing();
	let query = trx.selectFrom('episode').selectAll().where('channelId', '=', channelId);
	if ('episodeId' in target) query = query.where('id', '=', id);
	else if ('segmentId' in target)
		query = query.where('id', '=', (eb) =>
			eb.selectFrom('segment').select('segment.episodeId').where('segment.id', '=', id)
		);
	else
		query = query.where('id', '=', (eb) =>
			eb.selectFrom('segmentNote').select('segmentNote.episodeId').where('segmentNote.id', '=', id)
		);
	const episode = await query.forUpdate().executeTakeFirst();
	if (!episode) throw missing();
	refuseIfFixed(episode.stage, what);
	return episode;
}
