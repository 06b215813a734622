/**
 * Script approval: the host sends the script, a producer approves it or returns it with comments,
 * and either may comment on the whole script or on one segment. An approval records the
 * fingerprint of the text the producer read, so a later edit shows as "changed since approval".
 */
import { error } from '@sveltejs/kit';
import { db } from '../db';
import { DomainError } from '../http/api';
import {
	episodeDetailAndScriptFingerprint,
	episodeInChannel,
	type Actor,
	type EpisodeDetail,
	type Executor
} from './episodes';
import { refuseIfFixed } from './stage-locks';
import { shownScriptStatus } from '$lib/script/status';
import { queueMail } from '../mail/outbox';
import { scriptReviewedMail, scriptSubmittedMail } from '../mail/episode-messages';
import type { ScriptReviewInput } from '$lib/schemas/episodes';
import type { Role } from '../db/types';

const MAY: Record<ScriptReviewInput['action'], readonly Role[]> = {
	submit: ['host', 'producer'],
	approve: ['producer'],
	return: ['producer'],
	comment: ['host', 'producer']
};

const WORDS: Record<ScriptReviewInput['action'], string> = {
	submit: 'Sending the script for approval is the host’s or a producer’s job.',
	approve: 'Only a producer approves a script.',
	return: 'Only a producer returns a script with comments.',
	comment: 'Comments on the script come from the host or a producer.'
};

/** The review trail of an episode's script, oldest first. */
export async function reviewsFor(channelId: string, episodeId: string, executor: Executor = db) {
	await episodeInChannel(channelId, episodeId, executor);
	const rows = await executor
		.selectFrom('scriptReview')
		.leftJoin('person', 'person.id', 'scriptReview.personId')
		.leftJoin('segment', 'segment.id', 'scriptReview.segmentId')
		.select([
			'scriptReview.id',
			'scriptReview.kind',
			'scriptReview.body',
			'scriptReview.segmentId',
			'segment.title as segmentTitle',
			'segment.position as segmentPosition',
			'scriptReview.createdAt',
			'person.name as personName'
		])
		.where('scriptReview.episodeId', '=', episodeId)
		.orderBy('scriptReview.createdAt')
		.orderBy('scriptReview.id')
		.execute();
	return rows.map((row) => ({ ...row, createdAt: new Date(row.createdAt).toISOString() }));
}

export type ScriptReviewRow = Awaited<ReturnType<typeof reviewsFor>>[number];

async function activeProducers(executor: Executor, channelId: string) {
	return executor
		.selectFrom('membership')
		.innerJoin('person', 'person.id', 'membership.personId')
		.select(['person.id', 'person.name', 'person.email', 'membership.roles'])
		.where('membership.channelId', '=', channelId)
		.where('membership.disabledAt', 'is', null)
		.execute()
		.then((rows) => rows.filter((row) => row.roles.includes('producer')));
}

async function assignedHost(executor: Executor, episodeId: string) {
	return executor
		.selectFrom('episodeAssignment')
		.innerJoin('person', 'person.id', 'episodeAssignment.personId')
		.select(['person.id', 'person.name', 'person.email'])
		.where('episodeAssignment.episodeId', '=', episodeId)
		.where('episodeAssignment.role', '=', 'host')
		.executeTakeFirst();
}

/** Submits, approves, returns or comments on an episode's script, in one transaction with its mail. */
export async function reviewScript(
	channelId: string,
	actor: Actor,
	episodeId: string,
	input: ScriptReviewInput,
	origin: string
) {
	if (!MAY[input.action].some((role) => actor.roles.includes(role)))
		error(403, WORDS[input.action]);
	return db.transaction().execute(async (trx) => {
		const episode = await episodeInChannel(channelId, episodeId, trx, { lock: true });
		// Comments stay open; sending, approving and returning change the script's state.
		if (input.action !== 'comment') refuseIfFixed(episode.stage, 'script');
		// Read with the episode, under its lock: the script as saved now (script-status.ts).
		const fingerprint = episode.scriptFingerprint;
		const link = `${origin}/episodes/${episodeId}/script`;
		if (input.segmentId) {
			const segment = await trx
				.selectFrom('segment')
				.select('id')
				.where('id', '=', input.segmentId)
				.where('episodeId', '=', episodeId)
				.executeTakeFirst();
			if (!segment)
				throw new DomainError(400, 'That segment is not in this episode.', {
					segmentId: ['Pick a segment of this episode.']
				});
		}
		if (input.action === 'approve') {
			if (!input.fingerprint)
				throw new DomainError(
					400,
					'Approve from the script page, so Wrenchroll knows which text you read.',
					{ fingerprint: ['Missing.'] }
				);
			if (input.fingerprint !== fingerprint) {
				throw new DomainError(
					409,
					'The script changed while you were reading it. Read the new text, then approve again.',
					undefined,
					{ current: { fingerprint } }
				);
			}
		}
		const status = {
			submit: 'submitted',
			approve: 'approved',
			return: 'returned',
			comment: episode.scriptStatus
		} as const;
		await trx
			.updateTable('episode')
			.set({
				scriptStatus: status[input.action],
				...(input.action === 'approve'
					? {
							scriptApprovedFingerprint: fingerprint,
							scriptApprovedAt: new Date(),
							scriptApprovedBy: actor.id
						}
					: {}),
				...(input.action === 'return' || input.action === 'submit'
					? { scriptApprovedFingerprint: null, scriptApprovedAt: null, scriptApprovedBy: null }
					: {})
			})
			.where('id', '=', episodeId)
			.execute();
		const kind = {
			submit: 'submitted',
			approve: 'approved',
			return: 'returned',
			comment: 'comment'
		} as const;
		await trx
			.insertInto('scriptReview')
			.values({
				episodeId,
				segmentId: input.segmentId ?? null,
				personId: actor.id,
				kind: kind[input.action],
				body: input.body,
				fingerprint
			})
			.execute();
		if (input.action === 'submit') {
			for (const producer of await activeProducers(trx, channelId)) {
				if (producer.id === actor.id) continue;
				await queueMail(trx, {
					to: producer.email,
					channelId,
					...scriptSubmittedMail({
						producerName: producer.name,
						hostName: actor.name,
						episodeTitle: episode.title,
						link
					})
				});
			}
		}
		if (input.action === 'approve' || input.action === 'return') {
			const host = await assignedHost(trx, episodeId);
			if (host && host.id !== actor.id) {
				await queueMail(trx, {
					to: host.email,
					channelId,
					...scriptReviewedMail({
						hostName: host.name,
						producerName: actor.name,
						episodeTitle: episode.title,
						approved: input.action === 'approve',
						comment: input.body,
						link
					})
				});
			}
		}
		return { status: status[input.action], fingerprint };
	});
}

/** The script's approval state as the pages show it: one query (the episode keeps its script's fingerprint). */
export async function scriptStateFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
) {
	const { episode, scriptFingerprint } = await episodeDetailAndScriptFingerprint(
		channelId,
		episodeId,
		executor
	);
	return scriptStateOf(episode, scriptFingerprint);
}

/** The approval state from the episode already read and the fingerprint of its script as saved now. */
export function scriptStateOf(
	episode: Pick<
		EpisodeDetail,
		'scriptStatus' | 'scriptApprovedFingerprint' | 'scriptApprovedAt' | 'scriptApprovedByName'
	>,
	fingerprint: string
) {
	// The same rule as script-status.ts's SQL (IS DISTINCT FROM): approved, and the text differs.
	const changed =
		episode.scriptStatus === 'approved' && episode.scriptApprovedFingerprint !== fingerprint;
	return {
		status: episode.scriptStatus,
		fingerprint,
		changedSinceApproval: changed,
		shown: shownScriptStatus(episode.scriptStatus, changed),
		approvedAt: episode.scriptApprovedAt ? new Date(episode.scriptApprovedAt).toISOString() : null,
		approvedByName: episode.scriptApprovedByName ?? null
	};
}
