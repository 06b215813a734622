/**
 * Moving an episode along the production line. A move runs in one transaction: lock the episode,
 * check who is moving (src/lib/stages.ts), gather the gate snapshot and run the gate checks
 * (src/lib/gates.ts) for a forward move, change the stage, write the history row, and queue mail
 * to the people assigned to the stage it arrives at.
 */
import { chapterProblemsFor as editChapterProblems } from '../edit/edit';
import { featuredPartProblemsFor as featuredPartProblems } from '../merch/featured-parts';
import { error } from '@sveltejs/kit';
import { db } from '../db';
import { compiledOnce } from '../db/compiled-once';
import type { Role } from '../db/types';
import { DomainError } from '../http/api';
import { episodeInChannel, type Actor, type Executor } from './episodes';
import { assignmentMap } from './episode-crew';
import { queueMail } from '../mail/outbox';
import { stageArrivalMail } from '../mail/episode-messages';
import { gateChecksFor, type GateReason, type GateSnapshot } from '$lib/gates';
import { gateMaterialsFor, type GateMaterials } from './gate-snapshot';
import { isUuid } from '../auth/identity';
import {
	mayMoveStage,
	moveDirection,
	nextStage,
	previousStages,
	STAGE_LABELS,
	STAGE_OWNER,
	STAGE_WORK,
	forwardMoversText,
	type Stage
} from '$lib/stages';
import type { StageMoveInput } from '$lib/schemas/episodes';

/** Chapter rule violations for the lock gate (null: no chapters yet); the edit module owns the rules. */
export const chapterProblemsFor = editChapterProblems;

/** Featured parts the lock gate refuses (not linked, not active, no program time); the parts module owns the rules. */
export const featuredPartProblemsFor = featuredPartProblems;

/**
 * Everything the gate checks read, gathered in the caller's transaction: one query
 * (gate-snapshot.ts, which the home page also uses for many episodes at once).
 */
export async function gateSnapshotFor(
	channelId: string,
	episodeId: string,
	trx: Executor = db
): Promise<GateSnapshot> {
	return (await gateMaterialsFor(channelId, episodeId, trx)).snapshot;
}

export interface StageReport {
	stage: Stage;
	next: Stage | null;
	/** Why the episode may not move to `next` yet; empty when the gate passes. */
	reasons: GateReason[];
	/** Whether the person asking may move it forward (the gate is separate). */
	mayMoveForward: boolean;
	/** The earlier stages this person may move it back to. */
	mayMoveBackTo: Stage[];
	forwardMovers: string;
}

async function assignmentsOf(
	executor: Executor,
	episodeId: string
): Promise<Partial<Record<Role, string>>> {
	return assignmentMap(
		await executor
			.selectFrom('episodeAssignment')
			.select(['role', 'personId'])
			.where('episodeId', '=', episodeId)
			.execute()
	);
}

/** Where the episode stands, what its next gate says, and what this person may do about it: one query. */
export async function stageReportFor(
	channelId: string,
	episodeId: string,
	viewer: { id: string; roles: readonly Role[] },
	executor: Executor = db
): Promise<StageReport> {
	return stageReportOf(await gateMaterialsFor(channelId, episodeId, executor), viewer);
}

/** The stage report from gate materials already read (the episode page reads them once for this and the script state). */
export function stageReportOf(
	materials: Pick<GateMaterials, 'snapshot' | 'assignedIds'>,
	viewer: { id: string; roles: readonly Role[] }
): StageReport {
	const stage = materials.snapshot.stage;
	const next = nextStage(stage);
	const assignments = materials.assignedIds;
	const mover = { personId: viewer.id, roles: viewer.roles };
	return {
		stage,
		next,
		reasons: next ? gateChecksFor(materials.snapshot, next) : [],
		mayMoveForward: next !== null && mayMoveStage(mover, assignments, stage, next),
		mayMoveBackTo: previousStages(stage).filter((to) =>
			mayMoveStage(mover, assignments, stage, to)
		),
		forwardMovers: forwardMoversText(stage)
	};
}

/**
 * The history of moves, newest first, in one query scoped by the episode's channel: an episode of
 * another channel has none ([]). Callers pair it with a read of the episode that answers 404.
 */
/** The episode page reads it on every request: compiled once (db/compiled-once.ts). */
const stageHistoryQuery = compiledOnce(['channelId', 'episodeId'], ({ channelId, episodeId }) =>
	db
		.selectFrom('stageMove')
		.innerJoin('episode', 'episode.id', 'stageMove.episodeId')
		.leftJoin('person', 'person.id', 'stageMove.personId')
		.select([
			'stageMove.id',
			'stageMove.fromStage',
			'stageMove.toStage',
			'stageMove.note',
			'stageMove.createdAt',
			'person.name as personName'
		])
		.where('stageMove.episodeId', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.orderBy('stageMove.createdAt', 'desc')
		.orderBy('stageMove.id', 'desc')
);

export async function stageHistory(channelId: string, episodeId: string, executor: Executor = db) {
	if (!isUuid(episodeId)) return [];
	const { rows } = await stageHistoryQuery(executor, { channelId, episodeId });
	return rows.map((row) => ({ ...row, createdAt: new Date(row.createdAt).toISOString() }));
}

export type StageHistoryRow = Awaited<ReturnType<typeof stageHistory>>[number];

/**
 * Moves an episode. Forward moves pass the gate checks or are refused with 422 and the reasons in
 * `gate`; a move from a stage the episode already left answers 409; a person without the right
 * answers 403. Everything, history row and mail included, is one transaction.
 */
export async function moveStage(
	channelId: string,
	actor: Actor,
	episodeId: string,
	input: StageMoveInput,
	origin: string
) {
	return db.transaction().execute(async (trx) => {
		const episode = await episodeInChannel(channelId, episodeId, trx, { lock: true });
		const from = episode.stage;
		if (from !== input.from) {
			throw new DomainError(
				409,
				`Someone already moved this episode to ${STAGE_LABELS[from]}. Look at where it is now before moving it again.`,
				undefined,
				{ current: { stage: from } }
			);
		}
		const direction = moveDirection(from, input.to);
		if (direction === null) {
			throw new DomainError(
				400,
				input.to === from
					? `The episode is already at ${STAGE_LABELS[from]}.`
					: `An episode moves forward one stage at a time: from ${STAGE_LABELS[from]} the next stage is ${STAGE_LABELS[nextStage(from) ?? from]}.`,
				{ to: ['Not a move from here.'] }
			);
		}
		const assignments = await assignmentsOf(trx, episodeId);
		if (!mayMoveStage({ personId: actor.id, roles: actor.roles }, assignments, from, input.to)) {
			error(
				403,
				direction === 'back'
					? 'Only a producer moves an episode back.'
					: `${forwardMoversText(from)} moves an episode on from ${STAGE_LABELS[from]}.`
			);
		}
		if (direction === 'forward') {
			const reasons = gateChecksFor(await gateSnapshotFor(channelId, episodeId, trx), input.to);
			if (reasons.length > 0) {
				throw new DomainError(
					422,
					`Not ready for ${STAGE_LABELS[input.to]} yet: ${reasons.length} thing${reasons.length === 1 ? '' : 's'} to do first.`,
					undefined,
					{
						gate: { passed: false, to: input.to, reasons }
					}
				);
			}
		}
		await trx.updateTable('episode').set({ stage: input.to }).where('id', '=', episodeId).execute();
		const move = await trx
			.insertInto('stageMove')
			.values({
				episodeId,
				personId: actor.id,
				fromStage: from,
				toStage: input.to,
				note: input.note
			})
			.returning(['id', 'fromStage', 'toStage', 'note', 'createdAt'])
			.executeTakeFirstOrThrow();
		await queueArrivalMail(trx, {
			channelId,
			episodeId,
			episodeTitle: episode.title,
			stage: input.to,
			direction,
			actor,
			note: input.note,
			origin
		});
		return {
			episode: { id: episodeId, stage: input.to },
			move: { ...move, createdAt: new Date(move.createdAt).toISOString(), personName: actor.name },
			gate: { passed: true, to: input.to, reasons: [] as GateReason[] }
		};
	});
}

/** Mails the person assigned to the role that works the arrival stage (not the mover themself). */
async function queueArrivalMail(
	trx: Executor,
	input: {
		channelId: string;
		episodeId: string;
		episodeTitle: string;
		stage: Stage;
		direction: 'forward' | 'back';
		actor: Actor;
		note: string;
		origin: string;
	}
): Promise<void> {
	const role = STAGE_OWNER[input.stage];
	if (!role) return;
	const assignee = await trx
		.selectFrom('episodeAssignment')
		.innerJoin('person', 'person.id', 'episodeAssignment.personId')
		.innerJoin('membership', (join) =>
			join
				.onRef('membership.personId', '=', 'person.id')
				.on('membership.channelId', '=', input.channelId)
		)
		.select(['person.id', 'person.name', 'person.email'])
		.where('episodeAssignment.episodeId', '=', input.episodeId)
		.where('episodeAssignment.role', '=', role)
		.where('membership.disabledAt', 'is', null)
		.executeTakeFirst();
	if (!assignee || assignee.id === input.actor.id) return;
	await queueMail(trx, {
		to: assignee.email,
		channelId: input.channelId,
		...stageArrivalMail({
			personName: assignee.name,
			episodeTitle: input.episodeTitle,
			stageLabel: STAGE_LABELS[input.stage],
			direction: input.direction,
			moverName: input.actor.name,
			stageWork: STAGE_WORK[input.stage].toLowerCase(),
			note: input.note,
			link: `${input.origin}/episodes/${input.episodeId}`
		})
	});
}
