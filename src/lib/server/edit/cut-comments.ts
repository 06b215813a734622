/**
 * Comments on a version of the cut: at a frame or over a range of programme time, with replies and
 * the editor's answer (resolved, or won't change with a reason). Mentioning a crew member (`@` and
 * their name) mails them through the outbox, once each. Who may do what is in $lib/cut-review.
 */
import { error } from '@sveltejs/kit';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import type { Role } from '../db/types';
import type { Executor } from '../episodes/episodes';
import { episodeOpenFor } from '../episodes/stage-locks';
import { clockOfEpisode } from '../episodes/programme-timecode';
import { queueMail } from '../mail/outbox';
import { positionFromText } from '../episodes/typed-timecode';
import { currentVersionIn } from './cut-versions';
import {
	mentionedMembers,
	SETTLE_ROLES,
	versionLabel,
	type CutCommentState
} from '$lib/cut-review';
import type { CommentAnswer, CommentCreate } from '$lib/schemas/cut-review';
import { secondsToFrames } from '$lib/timecode';

export interface CutCommentView {
	id: string;
	versionId: string;
	startFrame: number;
	endFrame: number | null;
	body: string;
	authorName: string | null;
	state: CutCommentState;
	stateReason: string | null;
	stateByName: string | null;
	carriedFrom: number | null;
	version: number;
	createdAt: string;
	replies: { id: string; body: string; authorName: string | null; createdAt: string }[];
}

const commentNotFound = () => notFound('That comment');

/** Every comment of the episode with its replies, in programme-time order: one query. */
export async function cutCommentsFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<CutCommentView[]> {
	if (!isUuid(episodeId)) return [];
	const rows = await executor
		.selectFrom('cutComment')
		.innerJoin('episode', 'episode.id', 'cutComment.episodeId')
		.leftJoin('person as author', 'author.id', 'cutComment.authorId')
		.leftJoin('person as settler', 'settler.id', 'cutComment.stateBy')
		.select((eb) => [
			'cutComment.id',
			'cutComment.cutVersionId as versionId',
			'cutComment.startFrame',
			'cutComment.endFrame',
			'cutComment.body',
			'author.name as authorName',
			'cutComment.state',
			'cutComment.stateReason',
			'settler.name as stateByName',
			'cutComment.carriedFrom',
			'cutComment.version',
			'cutComment.createdAt',
			jsonArrayFrom(
				eb
					.selectFrom('cutCommentReply')
					.leftJoin('person', 'person.id', 'cutCommentReply.authorId')
					.select([
						'cutCommentReply.id',
						'cutCommentReply.body',
						'person.name as authorName',
						'cutCommentReply.createdAt'
					])
					.whereRef('cutCommentReply.commentId', '=', 'cutComment.id')
					.orderBy('cutCommentReply.createdAt')
			).as('replies')
		])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.orderBy('cutComment.startFrame')
		.orderBy('cutComment.createdAt')
		.execute();
	return rows.map((row) => ({
		...row,
		createdAt: new Date(row.createdAt).toISOString(),
		replies: row.replies.map((reply) => ({
			...reply,
			createdAt: new Date(reply.createdAt).toISOString()
		}))
	}));
}

/** The channel's active crew, for the mention picker and the mail. */
export async function mentionableCrew(channelId: string, executor: Executor = db) {
	return executor
		.selectFrom('membership')
		.innerJoin('person', 'person.id', 'membership.personId')
		.select(['person.id', 'person.name', 'person.email'])
		.where('membership.channelId', '=', channelId)
		.where('membership.disabledAt', 'is', null)
		.orderBy('person.name')
		.execute();
}

function mentionMail(input: {
	personName: string;
	authorName: string;
	episodeTitle: string;
	where: string;
	body: string;
	link: string;
}) {
	return {
		subject: `${input.authorName} mentioned you on the cut of ${input.episodeTitle}`,
		text: [
			`Hi ${input.personName.split(' ')[0]},`,
			'',
			`${input.authorName} mentioned you in a comment at ${input.where} on the cut of “${input.episodeTitle}”:`,
			'',
			input.body,
			'',
			'Watch that moment and answer:',
			input.link
		].join('\n')
	};
}

/** Mails each crew member the text mentions (not the writer), once each, inside the write's transaction. */
async function mailMentions(
	trx: Executor,
	input: {
		channelId: string;
		author: { id: string; name: string };
		episode: { id: string; title: string };
		where: string;
		body: string;
		origin: string;
	}
): Promise<number> {
	const crew = await mentionableCrew(input.channelId, trx);
	const mentioned = mentionedMembers(input.body, crew).filter(
		(member) => member.id !== input.author.id
	);
	for (const member of mentioned)
		await queueMail(trx, {
			to: member.email,
			channelId: input.channelId,
			...mentionMail({
				personName: member.name,
				authorName: input.author.name,
				episodeTitle: input.episode.title,
				where: input.where,
				body: input.body,
				link: `${input.origin}/episodes/${input.episode.id}/screening`
			})
		});
	return mentioned.length;
}

/** Leaves a comment on the current version at a frame or over a range; mentions are mailed. */
export async function addComment(
	channelId: string,
	author: { id: string; name: string },
	episodeId: string,
	input: CommentCreate,
	origin: string
): Promise<{ id: string; mentioned: number }> {
	return db.transaction().execute(async (trx) => {
		const episode = await episodeOpenFor(trx, channelId, 'cut', { episodeId });
		const clock = clockOfEpisode(episode);
		const version = await currentVersionIn(trx, episode.id, input.versionId);
		const startFrame = input.atFrame ?? positionFromText(input.at!, clock, 'at');
		const endFrame =
			input.untilFrame ?? (input.until ? positionFromText(input.until, clock, 'until') : null);
		if (endFrame !== null && endFrame <= startFrame) {
			const message = `The end of the range has to come after its start (${clock.format(startFrame)}).`;
			throw new DomainError(400, message, { until: [message] });
		}
		const footage = await trx
			.selectFrom('footage')
			.select('durationSeconds')
			.where('id', '=', version.footageId)
			.executeTakeFirst();
		const length =
			footage?.durationSeconds == null
				? null
				: secondsToFrames(Number(footage.durationSeconds), episode.frameRate);
		if (length !== null && (endFrame ?? startFrame + 1) > length) {
			const message = `${versionLabel(version.number)} ends at ${clock.format(length)}: put the comment inside it.`;
			throw new DomainError(400, message, { [endFrame !== null ? 'until' : 'at']: [message] });
		}
		const row = await trx
			.insertInto('cutComment')
			.values({
				episodeId: episode.id,
				cutVersionId: version.id,
				startFrame,
				endFrame,
				body: input.body,
				authorId: author.id
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		const mentioned = await mailMentions(trx, {
			channelId,
			author,
			episode,
			where: `${versionLabel(version.number)} ${clock.format(startFrame)}`,
			body: input.body,
			origin
		});
		return { id: row.id, mentioned };
	});
}

async function commentIn(trx: Executor, episodeId: string, commentId: string) {
	if (!isUuid(commentId)) throw commentNotFound();
	const row = await trx
		.selectFrom('cutComment')
		.innerJoin('cutVersion', 'cutVersion.id', 'cutComment.cutVersionId')
		.select([
			'cutComment.id',
			'cutComment.startFrame',
			'cutComment.authorId',
			'cutComment.state',
			'cutVersion.number'
		])
		.where('cutComment.id', '=', commentId)
		.where('cutComment.episodeId', '=', episodeId)
		.executeTakeFirst();
	if (!row) throw commentNotFound();
	return row;
}

/** A reply under a comment (anyone of the crew); mentions are mailed as in a comment. */
export async function replyToComment(
	channelId: string,
	author: { id: string; name: string },
	episodeId: string,
	commentId: string,
	body: string,
	origin: string
): Promise<{ id: string; mentioned: number }> {
	return db.transaction().execute(async (trx) => {
		const episode = await episodeOpenFor(trx, channelId, 'cut', { episodeId });
		const comment = await commentIn(trx, episode.id, commentId);
		const row = await trx
			.insertInto('cutCommentReply')
			.values({ commentId: comment.id, authorId: author.id, body })
			.returning('id')
			.executeTakeFirstOrThrow();
		const mentioned = await mailMentions(trx, {
			channelId,
			author,
			episode,
			where: `${versionLabel(comment.number)} ${clockOfEpisode(episode).format(comment.startFrame)}`,
			body,
			origin
		});
		return { id: row.id, mentioned };
	});
}

/**
 * Resolved, won't change (with its reason) or open again. The editor and the producer answer for
 * good; whoever wrote the comment may open it again or resolve it themselves.
 */
export async function answerComment(
	channelId: string,
	caller: { id: string; roles: readonly Role[] },
	episodeId: string,
	commentId: string,
	input: CommentAnswer
): Promise<void> {
	await db.transaction().execute(async (trx) => {
		const episode = await episodeOpenFor(trx, channelId, 'cut', { episodeId });
		const comment = await commentIn(trx, episode.id, commentId);
		const settles = SETTLE_ROLES.some((role) => caller.roles.includes(role));
		const ownsIt = comment.authorId === caller.id && input.state !== 'wont_change';
		if (!settles && !ownsIt)
			error(
				403,
				"The editor or the producer answers a comment (resolved, or won't change with a reason); whoever wrote it may resolve it or open it again."
			);
		const updated = await trx
			.updateTable('cutComment')
			.set((eb) => ({
				state: input.state,
				stateReason: input.state === 'open' ? null : input.reason ? input.reason : null,
				stateBy: input.state === 'open' ? null : caller.id,
				stateAt: input.state === 'open' ? null : new Date(),
				version: eb('version', '+', 1)
			}))
			.where('id', '=', comment.id)
			.where('version', '=', input.version)
			.executeTakeFirst();
		if (Number(updated.numUpdatedRows) !== 1)
			throw new DomainError(
				409,
				'Someone answered this comment while you were reading it. Reload the page to see their answer.'
			);
	});
}
