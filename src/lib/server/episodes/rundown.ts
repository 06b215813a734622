/**
 * Reading the rundown: an episode's ordered segments, each with its script, the caution of every
 * hazard it is flagged with, and its shot list with take counts, in one query. Every function takes
 * the channel id and reaches a segment only through its episode's channel.
 */
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import { isUuid } from '../auth/identity';
import { episodeInChannel, type Executor } from './episodes';
import { hostPaceFor } from './host-pace';
import { cautionView, hazardOrder, type CautionView } from './cautions';
import { segmentNotFound } from './segment-in-channel';
import type { HazardId } from '$lib/cautions';
import { estimateSpokenSeconds } from '$lib/script/timing';
import { spokenWords, spokenWordsEach } from '$lib/server/episodes/script-reader';
import { SEGMENT_KIND_INFO, type SegmentKind } from '$lib/rundown';
import { clockOfEpisode } from './programme-timecode';

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
			'episode.timecodeDropFrame',
			'episode.timecodeStart',
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
						'caution.durationFrames',
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

/** `words` is the script's spoken-word count, read beforehand through `script-reader`. */
function toView(row: SegmentRow, wordsPerMinute: number, words: number): SegmentView {
	const programme = clockOfEpisode(row);
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
		// A length, so in the episode's form without its start offset.
		recordedTimecode:
			row.recordedFrames === null ? null : programme.formatLength(row.recordedFrames),
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
			.map((caution) => cautionView(caution, programme))
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
	const episode = await episodeInChannel(channelId, episodeId, executor);
	const [pace, rows] = await Promise.all([
		hostPaceFor(channelId, episodeId, executor),
		segmentsQuery(executor, channelId)
			.where('segment.episodeId', '=', episodeId)
			.orderBy('segment.position')
			.execute()
	]);
	const words = await spokenWordsEach(rows.map((row) => row.scriptBody));
	const segments = rows.map((row, index) => toView(row, pace.wordsPerMinute, words[index]));
	// Spoken time is compared with the planned time of the segments that are spoken (they have
	// script words); wordless work segments are counted apart, not against the speech.
	const spoken = segments.filter((segment) => segment.words > 0);
	const totals = {
		plannedSeconds: segments.reduce((sum, segment) => sum + segment.plannedSeconds, 0),
		words: segments.reduce((sum, segment) => sum + segment.words, 0),
		spokenSeconds: segments.reduce((sum, segment) => sum + segment.spokenSeconds, 0),
		spokenSegments: spoken.length,
		spokenPlannedSeconds: spoken.reduce((sum, segment) => sum + segment.plannedSeconds, 0),
		wordlessSegments: segments.length - spoken.length,
		wordlessPlannedSeconds: segments
			.filter((segment) => segment.words === 0)
			.reduce((sum, segment) => sum + segment.plannedSeconds, 0)
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
