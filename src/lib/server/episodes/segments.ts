/**
 * The rundown: an episode's ordered segments, each with its script, the caution of every hazard it
 * is flagged with, and its shot list. Every function takes the channel id and reaches a segment
 * only through its episode's channel. Segments, scripts and cautions each carry a version; a save
 * that names a stale one answers 409 with the current row in `current`.
 */
import { error } from '@sveltejs/kit';
import { sql } from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { episodeInChannel, hostPaceFor, type Actor, type Executor } from './episodes';
import { frameFromTyped } from '../edit/typed-time';
import { HAZARDS, hazardById, isHazardId, type HazardId } from '$lib/cautions';
import { estimateSpokenSeconds } from '$lib/script/timing';
import { spokenWords, spokenWordsEach } from '$lib/server/episodes/script-reader';
import { SEGMENT_KIND_INFO, type SegmentKind } from '$lib/rundown';
import {
	formatClock,
	formatTimecode,
	framesToSeconds,
	parseTypedTime,
	type FrameRate
} from '$lib/timecode';
import {
	MAX_SEGMENTS_PER_EPISODE,
	type CautionUpdate,
	type SegmentCreate,
	type SegmentUpdate,
	type ShotCreate
} from '$lib/schemas/episodes';
import type { Role } from '../db/types';

export const segmentNotFound = () => notFound('That segment');

export interface CautionView {
	id: string;
	hazard: HazardId;
	label: string;
	text: string;
	defaultText: string;
	atFrame: number | null;
	/** Timecode at the episode's rate (drop-frame at 29.97 and 59.94), null when not placed. */
	atTimecode: string | null;
	atClock: string | null;
	version: number;
}

export interface ShotView {
	id: string;
	what: string;
	angle: string;
	roll: 'A' | 'B';
	camera: string;
	notes: string;
	position: number;
	version: number;
	takes: number;
	goodTakes: number;
	goodTakesWithFootage: number;
}

export interface SegmentView {
	id: string;
	episodeId: string;
	position: number;
	kind: SegmentKind;
	kindLabel: string;
	title: string;
	plannedSeconds: number;
	buildId: string | null;
	buildName: string | null;
	needsFootage: boolean;
	hazards: HazardId[];
	recordedFrames: number | null;
	recordedTimecode: string | null;
	promiseEpisodeId: string | null;
	promiseEpisodeTitle: string | null;
	promiseEpisodeStage: string | null;
	promiseTitle: string | null;
	version: number;
	script: { body: string; version: number; updatedAt: string; updatedByName: string | null };
	words: number;
	spokenSeconds: number;
	/** The cautions of the hazards the segment is flagged with, in the fixed hazard order. */
	cautions: CautionView[];
	shots: ShotView[];
}

/** Reads typed timecode or clock text at the episode's rate the way the pages show it (drop-frame at 29.97/59.94). */
export function framesFromText(text: string, rate: FrameRate, field: string): number {
	return frameFromTyped(field, () => parseTypedTime(text, rate));
}

const hazardOrder = new Map(HAZARDS.map((hazard, index) => [hazard.id, index]));

/** Flags are stored once each, in the fixed hazard order, so the gate names them in the order the page shows. */
function inHazardOrder(hazards: readonly HazardId[]): HazardId[] {
	return [...new Set(hazards)].sort(
		(a, b) => (hazardOrder.get(a) ?? 0) - (hazardOrder.get(b) ?? 0)
	);
}

function segmentsQuery(executor: Executor, channelId: string) {
	return executor
		.selectFrom('segment')
		.innerJoin('episode', 'episode.id', 'segment.episodeId')
		.innerJoin('segmentScript', 'segmentScript.segmentId', 'segment.id')
		.leftJoin('person as scriptEditor', 'scriptEditor.id', 'segmentScript.updatedBy')
		.leftJoin('build', 'build.id', 'segment.buildId')
		.leftJoin('episode as promised', 'promised.id', 'segment.promiseEpisodeId')
		.select((eb) => [
			'segment.id',
			'segment.episodeId',
			'segment.position',
			'segment.kind',
			'segment.title',
			'segment.plannedSeconds',
			'segment.buildId',
			'build.name as buildName',
			'segment.needsFootage',
			'segment.hazards',
			'segment.recordedFrames',
			'segment.promiseEpisodeId',
			'promised.title as promiseEpisodeTitle',
			'promised.stage as promiseEpisodeStage',
			'segment.promiseTitle',
			'segment.version',
			'episode.frameRate',
			'segmentScript.body as scriptBody',
			'segmentScript.version as scriptVersion',
			'segmentScript.updatedAt as scriptUpdatedAt',
			'scriptEditor.name as scriptUpdatedByName',
			jsonArrayFrom(
				eb
					.selectFrom('caution')
					.select([
						'caution.id',
						'caution.hazard',
						'caution.text',
						'caution.atFrame',
						'caution.version'
					])
					.whereRef('caution.segmentId', '=', 'segment.id')
			).as('cautionRows'),
			jsonArrayFrom(
				eb
					.selectFrom('shot')
					.select((shots) => [
						'shot.id',
						'shot.what',
						'shot.angle',
						'shot.roll',
						'shot.camera',
						'shot.notes',
						'shot.position',
						'shot.version',
						shots
							.selectFrom('take')
							.select((t) => t.fn.countAll<number>().as('n'))
							.whereRef('take.shotId', '=', 'shot.id')
							.as('takes'),
						shots
							.selectFrom('take')
							.select((t) => t.fn.countAll<number>().as('n'))
							.whereRef('take.shotId', '=', 'shot.id')
							.where('take.good', '=', true)
							.as('goodTakes'),
						shots
							.selectFrom('take')
							.select((t) => t.fn.countAll<number>().as('n'))
							.whereRef('take.shotId', '=', 'shot.id')
							.where('take.good', '=', true)
							.where('take.footageId', 'is not', null)
							.as('goodTakesWithFootage')
					])
					.whereRef('shot.segmentId', '=', 'segment.id')
					.orderBy('shot.position')
					.orderBy('shot.createdAt')
			).as('shotRows')
		])
		.where('episode.channelId', '=', channelId);
}

type SegmentRow = Awaited<ReturnType<ReturnType<typeof segmentsQuery>['execute']>>[number];

function cautionView(
	row: { id: string; hazard: HazardId; text: string; atFrame: number | null; version: number },
	rate: FrameRate
): CautionView {
	const hazard = hazardById(row.hazard);
	return {
		id: row.id,
		hazard: row.hazard,
		label: hazard?.label ?? row.hazard,
		text: row.text,
		defaultText: hazard?.defaultCaution ?? '',
		atFrame: row.atFrame,
		atTimecode: row.atFrame === null ? null : formatTimecode(row.atFrame, rate),
		atClock:
			row.atFrame === null
				? null
				: formatClock(framesToSeconds(row.atFrame, rate), { millis: true }),
		version: row.version
	};
}

/** `words` is the script's spoken-word count, read beforehand through `script-reader`. */
function toView(row: SegmentRow, wordsPerMinute: number, words: number): SegmentView {
	const rate = row.frameRate;
	const flagged = new Set(row.hazards);
	return {
		id: row.id,
		episodeId: row.episodeId,
		position: row.position,
		kind: row.kind,
		kindLabel: SEGMENT_KIND_INFO[row.kind]?.label ?? row.kind,
		title: row.title,
		plannedSeconds: row.plannedSeconds,
		buildId: row.buildId,
		buildName: row.buildName,
		needsFootage: row.needsFootage,
		hazards: [...row.hazards].sort((a, b) => (hazardOrder.get(a) ?? 0) - (hazardOrder.get(b) ?? 0)),
		recordedFrames: row.recordedFrames,
		recordedTimecode: row.recordedFrames === null ? null : formatTimecode(row.recordedFrames, rate),
		promiseEpisodeId: row.promiseEpisodeId,
		promiseEpisodeTitle: row.promiseEpisodeTitle,
		promiseEpisodeStage: row.promiseEpisodeStage,
		promiseTitle: row.promiseTitle,
		version: row.version,
		script: {
			body: row.scriptBody,
			version: row.scriptVersion,
			updatedAt: new Date(row.scriptUpdatedAt).toISOString(),
			updatedByName: row.scriptUpdatedByName
		},
		words,
		spokenSeconds: estimateSpokenSeconds(words, wordsPerMinute),
		cautions: row.cautionRows
			.filter((caution) => flagged.has(caution.hazard))
			.map((caution) => cautionView(caution, rate))
			.sort((a, b) => (hazardOrder.get(a.hazard) ?? 0) - (hazardOrder.get(b.hazard) ?? 0)),
		shots: row.shotRows.map((shot) => ({
			...shot,
			takes: Number(shot.takes ?? 0),
			goodTakes: Number(shot.goodTakes ?? 0),
			goodTakesWithFootage: Number(shot.goodTakesWithFootage ?? 0)
		}))
	};
}

/** The whole rundown of an episode with timings at the host's pace; 404 for another channel's episode. */
export async function rundownFor(channelId: string, episodeId: string, executor: Executor = db) {
	const episode = await episodeInChannel(executor, channelId, episodeId);
	const [pace, rows] = await Promise.all([
		hostPaceFor(channelId, episodeId, executor),
		segmentsQuery(executor, channelId)
			.where('segment.episodeId', '=', episodeId)
			.orderBy('segment.position')
			.execute()
	]);
	const words = await spokenWordsEach(rows.map((row) => row.scriptBody));
	const segments = rows.map((row, index) => toView(row, pace.wordsPerMinute, words[index]));
	const totals = {
		plannedSeconds: segments.reduce((sum, segment) => sum + segment.plannedSeconds, 0),
		words: segments.reduce((sum, segment) => sum + segment.words, 0),
		spokenSeconds: segments.reduce((sum, segment) => sum + segment.spokenSeconds, 0)
	};
	return {
		episode: {
			id: episode.id,
			title: episode.title,
			stage: episode.stage,
			frameRate: episode.frameRate,
			targetRuntimeSeconds: episode.targetRuntimeSeconds,
			cutDurationFrames: episode.cutDurationFrames
		},
		pace,
		segments,
		totals
	};
}

export type Rundown = Awaited<ReturnType<typeof rundownFor>>;

/** One segment with its episode's pace, for GET /api/segments/[id]; 404 outside the channel. */
export async function segmentView(
	channelId: string,
	segmentId: string,
	executor: Executor = db
): Promise<SegmentView> {
	if (!isUuid(segmentId)) throw segmentNotFound();
	const row = await segmentsQuery(executor, channelId)
		.where('segment.id', '=', segmentId)
		.executeTakeFirst();
	if (!row) throw segmentNotFound();
	const [pace, words] = await Promise.all([
		hostPaceFor(channelId, row.episodeId, executor),
		spokenWords(row.scriptBody)
	]);
	return toView(row, pace.wordsPerMinute, words);
}

/** The segment row with its episode (checked against the channel), optionally locked. */
async function segmentInChannel(
	executor: Executor,
	channelId: string,
	segmentId: string,
	options: { lock?: boolean } = {}
) {
	if (!isUuid(segmentId)) throw segmentNotFound();
	let query = executor
		.selectFrom('segment')
		.innerJoin('episode', 'episode.id', 'segment.episodeId')
		.selectAll('segment')
		.select([
			'episode.frameRate',
			'episode.stage',
			'episode.cutDurationFrames',
			'episode.title as episodeTitle'
		])
		.where('segment.id', '=', segmentId)
		.where('episode.channelId', '=', channelId);
	if (options.lock) query = query.forUpdate('segment');
	const row = await query.executeTakeFirst();
	if (!row) throw segmentNotFound();
	return row;
}

/** 404 unless the segment is one of this episode's (for pages whose URL names both). */
export async function assertSegmentOfEpisode(
	channelId: string,
	episodeId: string,
	segmentId: string
): Promise<void> {
	const segment = await segmentInChannel(db, channelId, segmentId);
	if (segment.episodeId !== episodeId) throw segmentNotFound();
}

async function checkBuild(
	executor: Executor,
	channelId: string,
	buildId: string | null | undefined
): Promise<void> {
	if (!buildId) return;
	const build = await executor
		.selectFrom('build')
		.select('id')
		.where('id', '=', buildId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!build)
		throw new DomainError(400, 'That build is not in this channel.', {
			buildId: ['Pick a build from the list.']
		});
}

/** Teasers alone may promise a follow-up; the promised episode must be another episode of this channel. */
async function checkPromise(
	executor: Executor,
	channelId: string,
	episodeId: string,
	kind: SegmentKind,
	promiseEpisodeId: string | null | undefined,
	promiseTitle: string | null | undefined
): Promise<void> {
	if (kind !== 'teaser' && (promiseEpisodeId || promiseTitle)) {
		throw new DomainError(
			400,
			'Only a teaser segment can promise a follow-up episode. Change the kind to teaser first.',
			{ promiseTitle: ['Only for teasers.'] }
		);
	}
	if (!promiseEpisodeId) return;
	if (promiseEpisodeId === episodeId)
		throw new DomainError(400, 'An episode cannot promise itself as its follow-up.', {
			promiseEpisodeId: ['Pick another episode.']
		});
	const promised = await executor
		.selectFrom('episode')
		.select('id')
		.where('id', '=', promiseEpisodeId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!promised)
		throw new DomainError(400, 'That episode is not in this channel.', {
			promiseEpisodeId: ['Pick an episode from the list.']
		});
}

/** Makes sure every flagged hazard has a caution row, starting from the default wording. */
async function ensureCautions(
	executor: Executor,
	segmentId: string,
	hazards: readonly HazardId[]
): Promise<void> {
	if (hazards.length === 0) return;
	await executor
		.insertInto('caution')
		.values(
			hazards.map((hazard) => ({ segmentId, hazard, text: hazardById(hazard).defaultCaution }))
		)
		.onConflict((conflict) => conflict.columns(['segmentId', 'hazard']).doNothing())
		.execute();
}

/** Adds a segment at the end of the rundown, with an empty script and the default caution of each flag. */
export async function createSegment(
	channelId: string,
	episodeId: string,
	input: SegmentCreate
): Promise<SegmentView> {
	return db.transaction().execute(async (trx) => {
		// Locking the episode serialises position numbers between two people adding at once.
		await episodeInChannel(trx, channelId, episodeId, { lock: true });
		await checkBuild(trx, channelId, input.buildId);
		await checkPromise(
			trx,
			channelId,
			episodeId,
			input.kind,
			input.promiseEpisodeId,
			input.promiseTitle
		);
		const { count, last } = await trx
			.selectFrom('segment')
			.select((eb) => [eb.fn.countAll<number>().as('count'), eb.fn.max('position').as('last')])
			.where('episodeId', '=', episodeId)
			.executeTakeFirstOrThrow();
		if (Number(count) >= MAX_SEGMENTS_PER_EPISODE)
			throw new DomainError(400, `An episode holds at most ${MAX_SEGMENTS_PER_EPISODE} segments.`);
		const hazards = inHazardOrder(input.hazards ?? []);
		const segment = await trx
			.insertInto('segment')
			.values({
				episodeId,
				position: Number(last ?? 0) + 1,
				kind: input.kind,
				title: input.title,
				plannedSeconds: input.plannedSeconds,
				buildId: input.buildId ?? null,
				needsFootage: input.needsFootage ?? SEGMENT_KIND_INFO[input.kind].needsFootage,
				hazards,
				recordedFrames: null,
				promiseEpisodeId: input.promiseEpisodeId ?? null,
				promiseTitle: input.promiseTitle || null
			})
			.returning('id')
			.executeTakeFirstOrThrow();
		await trx
			.insertInto('segmentScript')
			.values({ segmentId: segment.id, body: '', updatedBy: null })
			.execute();
		await ensureCautions(trx, segment.id, hazards);
		return segmentView(channelId, segment.id, trx);
	});
}

const staleSegment = async (channelId: string, segmentId: string, executor: Executor) =>
	new DomainError(
		409,
		'Someone changed this segment while you were editing. Their version is shown; your changes are still in the form.',
		undefined,
		{
			current: await segmentView(channelId, segmentId, executor)
		}
	);

/**
 * The host and producers change a segment's plan; the editor changes only its length in the cut.
 * Answers 403 for a field the caller's roles don't cover.
 */
export function checkSegmentChangeRoles(roles: readonly Role[], input: SegmentUpdate): void {
	const planFields = (
		[
			'kind',
			'title',
			'plannedSeconds',
			'buildId',
			'needsFootage',
			'hazards',
			'promiseEpisodeId',
			'promiseTitle'
		] as const
	).filter((field) => input[field] !== undefined);
	const setsRecorded = input.recorded !== undefined || input.recordedFrames !== undefined;
	if (planFields.length && !roles.some((role) => role === 'producer' || role === 'host'))
		error(
			403,
			'The segment’s plan is the host’s or a producer’s to change. You can set its length in the cut.'
		);
	if (setsRecorded && !roles.some((role) => role === 'producer' || role === 'editor'))
		error(403, 'The length in the cut is set by the editor or a producer.');
}

/** Changes a segment's details (not its script); new hazard flags get their default caution. */
export async function updateSegment(
	channelId: string,
	segmentId: string,
	input: SegmentUpdate
): Promise<SegmentView> {
	return db.transaction().execute(async (trx) => {
		const segment = await segmentInChannel(trx, channelId, segmentId, { lock: true });
		if (segment.version !== input.version) throw await staleSegment(channelId, segmentId, trx);
		const kind = input.kind ?? segment.kind;
		const promiseEpisodeId =
			input.promiseEpisodeId === undefined ? segment.promiseEpisodeId : input.promiseEpisodeId;
		const promiseTitle =
			input.promiseTitle === undefined ? segment.promiseTitle : input.promiseTitle || null;
		// Changing a teaser into another kind drops its promise rather than refusing the change.
		const keepsPromise = kind === 'teaser';
		if (keepsPromise)
			await checkPromise(trx, channelId, segment.episodeId, kind, promiseEpisodeId, promiseTitle);
		else if (input.promiseEpisodeId || input.promiseTitle)
			await checkPromise(
				trx,
				channelId,
				segment.episodeId,
				kind,
				input.promiseEpisodeId,
				input.promiseTitle
			);
		if (input.buildId !== undefined) await checkBuild(trx, channelId, input.buildId);
		const rate = segment.frameRate;
		let recordedFrames = segment.recordedFrames;
		if (input.recordedFrames !== undefined) recordedFrames = input.recordedFrames;
		else if (input.recorded !== undefined)
			recordedFrames =
				input.recorded === null || input.recorded === ''
					? null
					: framesFromText(input.recorded, rate, 'recorded');
		const hazards = input.hazards ? inHazardOrder(input.hazards) : segment.hazards;
		await trx
			.updateTable('segment')
			.set({
				kind,
				title: input.title ?? segment.title,
				plannedSeconds: input.plannedSeconds ?? segment.plannedSeconds,
				buildId: input.buildId === undefined ? segment.buildId : input.buildId,
				needsFootage: input.needsFootage ?? segment.needsFootage,
				hazards,
				recordedFrames,
				promiseEpisodeId: keepsPromise ? promiseEpisodeId : null,
				promiseTitle: keepsPromise ? promiseTitle : null,
				version: segment.version + 1,
				updatedAt: new Date()
			})
			.where('id', '=', segmentId)
			.execute();
		await ensureCautions(trx, segmentId, hazards);
		return segmentView(channelId, segmentId, trx);
	});
}

/** Removes a segment and closes the gap; refused once takes are logged against its shots. */
export async function deleteSegment(
	channelId: string,
	segmentId: string,
	version: number
): Promise<{ id: string }> {
	return db.transaction().execute(async (trx) => {
		const segment = await segmentInChannel(trx, channelId, segmentId, { lock: true });
		await episodeInChannel(trx, channelId, segment.episodeId, { lock: true });
		if (segment.version !== version) throw await staleSegment(channelId, segmentId, trx);
		const takes = await trx
			.selectFrom('take')
			.innerJoin('shot', 'shot.id', 'take.shotId')
			.select((eb) => eb.fn.countAll<number>().as('count'))
			.where('shot.segmentId', '=', segmentId)
			.executeTakeFirstOrThrow();
		if (Number(takes.count) > 0) {
			throw new DomainError(
				409,
				`“${segment.title}” has ${takes.count} logged take${Number(takes.count) === 1 ? '' : 's'}: it can’t be deleted. Untick “needs footage” or rename it instead.`
			);
		}
		await trx.deleteFrom('segment').where('id', '=', segmentId).execute();
		await trx
			.updateTable('segment')
			.set((eb) => ({ position: eb('position', '-', 1) }))
			.where('episodeId', '=', segment.episodeId)
			.where('position', '>', segment.position)
			.execute();
		return { id: segmentId };
	});
}

/** Puts the rundown in a new order; the list must name every segment of the episode exactly once. */
export async function reorderSegments(
	channelId: string,
	episodeId: string,
	order: readonly string[]
): Promise<{ order: string[] }> {
	return db.transaction().execute(async (trx) => {
		await episodeInChannel(trx, channelId, episodeId, { lock: true });
		const existing = (
			await trx
				.selectFrom('segment')
				.select('id')
				.where('episodeId', '=', episodeId)
				.orderBy('position')
				.execute()
		).map((row) => row.id);
		const known = new Set(existing);
		const seen = new Set<string>();
		const duplicates = order.filter((id) => (seen.has(id) ? true : (seen.add(id), false)));
		const unknown = order.filter((id) => !known.has(id));
		const missing = existing.filter((id) => !seen.has(id));
		if (duplicates.length || unknown.length || missing.length) {
			const problems = [
				...(missing.length
					? [
							`${missing.length} segment${missing.length === 1 ? ' is' : 's are'} missing from the new order.`
						]
					: []),
				...(unknown.length
					? [
							`${unknown.length} id${unknown.length === 1 ? ' is' : 's are'} not a segment of this episode.`
						]
					: []),
				...(duplicates.length
					? [
							`${duplicates.length} segment${duplicates.length === 1 ? ' is' : 's are'} listed twice.`
						]
					: [])
			];
			throw new DomainError(
				400,
				`The rundown was not reordered: ${problems.join(' ')} Reload the rundown and try again; nothing was changed.`,
				{ order: problems },
				{ missing, unknown, duplicates }
			);
		}
		if (order.length) {
			const values = sql.join(order.map((id, index) => sql`(${id}::uuid, ${index + 1}::int)`));
			await sql`UPDATE segment SET position = v.position, updated_at = now() FROM (VALUES ${values}) AS v(id, position) WHERE segment.id = v.id AND segment.episode_id = ${episodeId}`.execute(
				trx
			);
		}
		return { order: [...order] };
	});
}

/** One step up or down, for the rundown's buttons that work without JavaScript. */
export async function moveSegment(
	channelId: string,
	episodeId: string,
	segmentId: string,
	direction: 'up' | 'down'
): Promise<{ order: string[] }> {
	const segment = await segmentInChannel(db, channelId, segmentId);
	if (segment.episodeId !== episodeId) throw segmentNotFound();
	const ids = (
		await db
			.selectFrom('segment')
			.select('id')
			.where('episodeId', '=', segment.episodeId)
			.orderBy('position')
			.execute()
	).map((row) => row.id);
	const from = ids.indexOf(segmentId);
	const to = direction === 'up' ? from - 1 : from + 1;
	if (to < 0 || to >= ids.length) return { order: ids };
	[ids[from], ids[to]] = [ids[to], ids[from]];
	return reorderSegments(channelId, segment.episodeId, ids);
}

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

/** Who may change which part of a caution: the words are the writers', the placement the editor's. */
const CAUTION_TEXT_ROLES: readonly Role[] = ['producer', 'host'];
const CAUTION_PLACE_ROLES: readonly Role[] = ['producer', 'editor'];

/** Edits a caution's text and/or places it in the cut (typed timecode or clock time at the episode's rate). */
export async function updateCaution(
	channelId: string,
	actor: Actor,
	segmentId: string,
	hazard: string,
	input: CautionUpdate
): Promise<CautionView> {
	if (!isHazardId(hazard)) throw notFound('That caution');
	const changesText = input.text !== undefined;
	const changesPlace = input.at !== undefined || input.atFrame !== undefined;
	if (changesText && !CAUTION_TEXT_ROLES.some((role) => actor.roles.includes(role)))
		error(
			403,
			'The caution’s words are the host’s or a producer’s to change. You can place it in the cut.'
		);
	if (changesPlace && !CAUTION_PLACE_ROLES.some((role) => actor.roles.includes(role)))
		error(
			403,
			'Placing a caution in the cut is the editor’s or a producer’s job. You can change its words.'
		);
	return db.transaction().execute(async (trx) => {
		const segment = await segmentInChannel(trx, channelId, segmentId);
		const rate = segment.frameRate;
		const caution = await trx
			.selectFrom('caution')
			.selectAll()
			.where('segmentId', '=', segmentId)
			.where('hazard', '=', hazard)
			.forUpdate()
			.executeTakeFirst();
		if (!caution || !segment.hazards.includes(hazard)) throw notFound('That caution');
		if (caution.version !== input.version) {
			throw new DomainError(
				409,
				'Someone changed this caution while you were editing. Their version is shown; yours is still in the form.',
				undefined,
				{ current: cautionView(caution, rate) }
			);
		}
		let atFrame = caution.atFrame;
		if (input.atFrame !== undefined) atFrame = input.atFrame;
		else if (input.at !== undefined)
			atFrame = input.at === null || input.at === '' ? null : framesFromText(input.at, rate, 'at');
		if (
			atFrame !== null &&
			segment.cutDurationFrames !== null &&
			atFrame >= segment.cutDurationFrames
		) {
			const message = `${formatTimecode(atFrame, rate)} is after the end of the cut (${formatTimecode(segment.cutDurationFrames, rate)}): place the caution inside the cut.`;
			throw new DomainError(400, message, { at: [message] });
		}
		const updated = await trx
			.updateTable('caution')
			.set({
				text: input.text ?? caution.text,
				atFrame,
				version: caution.version + 1,
				updatedAt: new Date()
			})
			.where('id', '=', caution.id)
			.returningAll()
			.executeTakeFirstOrThrow();
		return cautionView(updated, rate);
	});
}

/** The shot list of one segment, in order. */
export async function listShots(channelId: string, segmentId: string): Promise<ShotView[]> {
	return (await segmentView(channelId, segmentId)).shots;
}

/** Adds a shot at the end of a segment's shot list. */
export async function addShot(
	channelId: string,
	segmentId: string,
	input: ShotCreate
): Promise<ShotView> {
	return db.transaction().execute(async (trx) => {
		await segmentInChannel(trx, channelId, segmentId, { lock: true });
		const { last } = await trx
			.selectFrom('shot')
			.select((eb) => eb.fn.max('position').as('last'))
			.where('segmentId', '=', segmentId)
			.executeTakeFirstOrThrow();
		const shot = await trx
			.insertInto('shot')
			.values({
				segmentId,
				what: input.what,
				angle: input.angle,
				roll: input.roll,
				camera: input.camera,
				notes: input.notes,
				position: Number(last ?? 0) + 1
			})
			.returningAll()
			.executeTakeFirstOrThrow();
		return {
			id: shot.id,
			what: shot.what,
			angle: shot.angle,
			roll: shot.roll,
			camera: shot.camera,
			notes: shot.notes,
			position: shot.position,
			version: shot.version,
			takes: 0,
			goodTakes: 0,
			goodTakesWithFootage: 0
		};
	});
}

/**
 * The placed cautions of an episode as marks for the edit timeline (shape of TimelineMark in
 * src/lib/components/timeline.ts: kind, atFrame, label, href). Unplaced ones are left out: the lock
 * gate names them instead.
 */
export async function cautionMarksFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
) {
	const episode = await episodeInChannel(executor, channelId, episodeId);
	const rows = await executor
		.selectFrom('caution')
		.innerJoin('segment', 'segment.id', 'caution.segmentId')
		.select([
			'caution.hazard',
			'caution.atFrame',
			'segment.id as segmentId',
			'segment.position',
			'segment.title'
		])
		.where('segment.episodeId', '=', episode.id)
		.where('caution.atFrame', 'is not', null)
		.where(sql<boolean>`caution.hazard = ANY(segment.hazards)`)
		.orderBy('caution.atFrame')
		.execute();
	return rows.map((row) => ({
		kind: 'caution' as const,
		atFrame: row.atFrame!,
		label: `${hazardById(row.hazard)?.label ?? row.hazard} · segment ${row.position} “${row.title}”`,
		href: `/episodes/${episode.id}/rundown/${row.segmentId}`
	}));
}
