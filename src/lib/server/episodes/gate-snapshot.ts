/**
 * Everything the gate checks read ($lib/gates), for one episode or for many, in one query: the
 * episode's own columns and, as JSON arrays beside them, its crew, segments with their scripts,
 * cautions, shots, takes, chapters and featured-part links (Kysely's relations recipe). The home
 * page asks for every unpublished episode of a channel at once, so its number of queries does not
 * grow with the number of episodes.
 *
 * Spoken words are counted by the script readers (Markdown in worker threads) and remembered per
 * episode with the fingerprint of the script they were counted from. The query is told that
 * fingerprint and sends the script's text only when the episode's stored fingerprint
 * (`episode.script_fingerprint`, kept by the database's triggers) differs from it: an unchanged
 * script is neither sent, nor hashed, nor read again.
 */
import { sql, type Expression } from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import { compiledOnce } from '../db/compiled-once';
import type { Role } from '../db/types';
import { episodeNotFound, type Executor } from './episodes';
import { isUuid } from '../auth/identity';
import { scriptFingerprint } from './fingerprint';
import { spokenWordsEach } from './script-reader';
import { problemsOf } from '../edit/edit';
import { featuredLinks, groupFeatured, lockWarnings } from '../merch/featured-parts';
import { assignmentMap } from './episode-crew';
import type { GateSnapshot, ScriptStatus } from '$lib/gates';
import { isHazardId, type HazardId } from '$lib/cautions';
import { programmeClock, programmeTimecode } from '$lib/timecode';
import type { CutApproval } from '$lib/cut-review';

/**
 * The gate materials of the channel's episodes. `countedFingerprint`: SQL for the fingerprint whose
 * spoken words the server already holds for the episode in scope (NULL: none); where it equals the
 * stored one, each segment's `body` comes back NULL instead of the text.
 */
function materialsQuery(
	executor: Executor,
	channelId: string,
	countedFingerprint: Expression<string | null>
) {
	return executor
		.selectFrom('episode')
		.innerJoin('channel', 'channel.id', 'episode.channelId')
		.select((eb) => [
			'episode.id',
			'episode.title',
			'episode.stage',
			'episode.frameRate',
			'episode.timecodeDropFrame',
			'episode.timecodeStart',
			'episode.cutDurationFrames',
			'episode.publishDate',
			'episode.scriptStatus',
			'episode.scriptApprovedFingerprint',
			'episode.scriptFingerprint',
			'channel.disclosure',
			jsonArrayFrom(
				eb
					.selectFrom('episodeAssignment')
					.innerJoin('person', 'person.id', 'episodeAssignment.personId')
					.select(['episodeAssignment.role', 'episodeAssignment.personId', 'person.name'])
					.whereRef('episodeAssignment.episodeId', '=', 'episode.id')
			).as('assignments'),
			jsonArrayFrom(
				eb
					.selectFrom('segment')
					.innerJoin('segmentScript', 'segmentScript.segmentId', 'segment.id')
					.select([
						'segment.id',
						'segment.position',
						'segment.title',
						'segment.needsFootage',
						'segment.hazards',
						'segment.cutInFrame',
						'segment.cutOutFrame',
						sql<
							string | null
						>`CASE WHEN episode.script_fingerprint = ${countedFingerprint} THEN NULL ELSE segment_script.body END`.as(
							'body'
						)
					])
					.whereRef('segment.episodeId', '=', 'episode.id')
					.orderBy('segment.position')
			).as('segments'),
			jsonArrayFrom(
				eb
					.selectFrom('caution')
					.innerJoin('segment', 'segment.id', 'caution.segmentId')
					.select([
						'caution.segmentId',
						'caution.hazard',
						'caution.text',
						'caution.atFrame',
						'caution.durationFrames'
					])
					.whereRef('segment.episodeId', '=', 'episode.id')
			).as('cautions'),
			jsonArrayFrom(
				eb
					.selectFrom('shot')
					.innerJoin('segment', 'segment.id', 'shot.segmentId')
					.select(['shot.id', 'shot.segmentId', 'shot.what'])
					.whereRef('segment.episodeId', '=', 'episode.id')
					.orderBy('shot.position')
			).as('shots'),
			jsonArrayFrom(
				eb
					.selectFrom('take')
					.innerJoin('shot', 'shot.id', 'take.shotId')
					.innerJoin('segment', 'segment.id', 'shot.segmentId')
					.leftJoin('footage', 'footage.id', 'take.footageId')
					.select([
						'take.shotId',
						'take.clipName',
						'take.good',
						'take.footageId',
						'footage.frameRate as footageFrameRate',
						'footage.variableFrameRate as footageVariableRate'
					])
					.whereRef('segment.episodeId', '=', 'episode.id')
					.orderBy('take.createdAt')
			).as('takes'),
			jsonArrayFrom(
				eb
					.selectFrom('chapter')
					.select(['chapter.id', 'chapter.startFrame', 'chapter.title', 'chapter.url'])
					.whereRef('chapter.episodeId', '=', 'episode.id')
					// The edit page's order (edit.ts): ties keep the order they were made in.
					.orderBy('chapter.startFrame')
					.orderBy('chapter.createdAt')
					.orderBy('chapter.id')
			).as('chapters'),
			eb
				.selectFrom('cutVersion')
				.select(sql<string>`number || ':' || approval`.as('current'))
				.whereRef('cutVersion.episodeId', '=', 'episode.id')
				.orderBy('cutVersion.number', 'desc')
				.limit(1)
				.as('currentCut'),
			eb
				.selectFrom('cutComment')
				.select(sql<number>`count(*)::integer`.as('open'))
				.whereRef('cutComment.episodeId', '=', 'episode.id')
				.where('cutComment.state', '=', 'open')
				.as('openCutComments'),
			jsonArrayFrom(
				featuredLinks(executor, eb.ref('episode.id'))
					.orderBy(sql`segment_note.program_frame ASC NULLS LAST`)
					.orderBy('segmentNote.createdAt')
			).as('featured')
		])
		.where('episode.channelId', '=', channelId);
}

type Materials = Awaited<ReturnType<ReturnType<typeof materialsQuery>['execute']>>[number];

/** What the gate reads, and what the stage report and the script state need beside it. */
export interface GateMaterials {
	id: string;
	title: string;
	scriptStatus: string;
	publishDate: string | null;
	snapshot: GateSnapshot;
	/** Role → id of the assigned person (who may move the episode on). */
	assignedIds: Partial<Record<Role, string>>;
}

const WORDS_REMEMBERED = 500;
const wordsByFingerprint = new Map<string, Promise<number[]>>();

/**
 * Spoken words of each segment of a script, remembered by the script's fingerprint: reading the
 * same script again costs a hash, not a Markdown parse per segment, and requests arriving together
 * share one read. The oldest entry goes first; a read that fails is forgotten.
 */
export function spokenWordsOfScript(
	segments: readonly { id: string; body: string }[],
	fingerprint = scriptFingerprint(segments)
): Promise<number[]> {
	const known = wordsByFingerprint.get(fingerprint);
	if (known) return known;
	const words = spokenWordsEach(segments.map((segment) => segment.body));
	if (wordsByFingerprint.size >= WORDS_REMEMBERED)
		wordsByFingerprint.delete(wordsByFingerprint.keys().next().value!);
	wordsByFingerprint.set(fingerprint, words);
	words.catch(() => wordsByFingerprint.delete(fingerprint));
	return words;
}

function groupBy<T, K>(rows: readonly T[], key: (row: T) => K): Map<K, T[]> {
	const groups = new Map<K, T[]>();
	for (const row of rows) {
		const group = groups.get(key(row));
		if (group) group.push(row);
		else groups.set(key(row), [row]);
	}
	return groups;
}

/** `"2:approved"` (number and answer of the newest version) as the gate reads it; null: no cut. */
function currentCutOf(text: string | null): GateSnapshot['cutReview']['current'] {
	if (!text) return null;
	const [number, approval] = text.split(':');
	return {
		number: Number(number),
		approval: approval as CutApproval
	};
}

/** An episode's spoken words per segment, and the fingerprint of the script they were counted from. */
interface CountedScript {
	channelId: string;
	fingerprint: string;
	words: Promise<number[]>;
}

/** By episode id, the most recently used last (at most WORDS_REMEMBERED). */
const countedScripts = new Map<string, CountedScript>();

/** The counts held now for the channel's episodes (episode id → what was counted, and from which fingerprint). */
function countedInChannel(channelId: string): Map<string, CountedScript> {
	const held = new Map<string, CountedScript>();
	for (const [id, counted] of countedScripts)
		if (counted.channelId === channelId) held.set(id, counted);
	return held;
}

/** Holds `counted` as the episode's newest (a read that fails is forgotten). */
function rememberCounted(episodeId: string, counted: CountedScript): void {
	const fresh = countedScripts.get(episodeId) !== counted;
	countedScripts.delete(episodeId);
	if (countedScripts.size >= WORDS_REMEMBERED)
		countedScripts.delete(countedScripts.keys().next().value!);
	countedScripts.set(episodeId, counted);
	if (fresh)
		counted.words.catch(() => {
			if (countedScripts.get(episodeId) === counted) countedScripts.delete(episodeId);
		});
}

/**
 * `counted`: what the query was told for this episode. When it names the stored fingerprint the
 * rows came without text and its words stand; otherwise the text came and is counted (and shared
 * with any request counting the same script at the same time).
 */
async function materialsOf(
	row: Materials,
	channelId: string,
	counted: CountedScript | undefined
): Promise<GateMaterials> {
	const fingerprint = row.scriptFingerprint;
	let words: Promise<number[]>;
	if (counted?.fingerprint === fingerprint) {
		words = counted.words;
		rememberCounted(row.id, counted);
	} else {
		const scripts = row.segments.map((segment) => ({ id: segment.id, body: segment.body ?? '' }));
		words = spokenWordsOfScript(scripts, fingerprint);
		rememberCounted(row.id, { channelId, fingerprint, words });
	}
	const spoken = await words;
	const shotsBySegment = groupBy(row.shots, (shot) => shot.segmentId);
	const takesByShot = groupBy(row.takes, (take) => take.shotId);
	const cautionsBySegment = groupBy(row.cautions, (caution) => caution.segmentId);
	const timecode = programmeTimecode(row);
	const featured = groupFeatured(row.featured, programmeClock(timecode));
	const snapshot: GateSnapshot = {
		stage: row.stage,
		frameRate: row.frameRate,
		timecode,
		cutDurationFrames: row.cutDurationFrames,
		publishDate: row.publishDate,
		assignments: Object.fromEntries(row.assignments.map((a) => [a.role, a.name])),
		script: {
			status: row.scriptStatus as ScriptStatus,
			approvedFingerprint: row.scriptApprovedFingerprint,
			currentFingerprint: fingerprint
		},
		segments: row.segments.map((segment, index) => ({
			id: segment.id,
			position: segment.position,
			title: segment.title,
			needsFootage: segment.needsFootage,
			words: spoken[index],
			hazards: segment.hazards.filter((hazard): hazard is HazardId => isHazardId(hazard)),
			inFrame: segment.cutInFrame,
			outFrame: segment.cutOutFrame,
			shots: (shotsBySegment.get(segment.id) ?? []).map((shot) => ({
				id: shot.id,
				what: shot.what,
				takes: (takesByShot.get(shot.id) ?? []).map((take) => ({
					clipName: take.clipName,
					good: take.good,
					hasFootage: take.footageId !== null,
					footageFrameRate: take.footageFrameRate,
					footageVariableRate: take.footageVariableRate
				}))
			})),
			cautions: (cautionsBySegment.get(segment.id) ?? []).map((caution) => ({
				hazard: caution.hazard,
				text: caution.text,
				atFrame: caution.atFrame,
				durationFrames: caution.durationFrames
			}))
		})),
		chapterProblems:
			row.chapters.length === 0
				? null
				: problemsOf(row.chapters, row.cutDurationFrames, row.frameRate).map(
						(problem) => problem.message
					),
		// A note without a program time is the editor's to place; a part that isn't active is merch's to replace.
		featuredPartProblems: lockWarnings(featured).map((warning) => ({
			message: warning.message,
			fixedBy: warning.kind === 'no-program-time' ? 'editor' : 'merch'
		})),
		cutReview: {
			current: currentCutOf(row.currentCut),
			openComments: Number(row.openCutComments ?? 0)
		},
		publishing: {
			title: row.title,
			disclosure: row.disclosure,
			// The publish kit makes one tracked link per part linked on the episode's notes.
			trackedLinks: new Set(row.featured.map((link) => link.partId)).size
		}
	};
	return {
		id: row.id,
		title: row.title,
		scriptStatus: row.scriptStatus,
		publishDate: row.publishDate,
		snapshot,
		assignedIds: assignmentMap(row.assignments)
	};
}

/** One episode's materials: read on every episode page and API call, so compiled once. */
const materialsOfEpisode = compiledOnce(
	['channelId', 'episodeId', 'countedFingerprint'],
	({ channelId, episodeId, countedFingerprint }) =>
		materialsQuery(db, channelId, sql.val(countedFingerprint)).where('episode.id', '=', episodeId)
);

/** The gate materials of one episode of the channel, in one query; 404 otherwise. */
export async function gateMaterialsFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<GateMaterials> {
	if (!isUuid(episodeId)) throw episodeNotFound();
	const held = countedScripts.get(episodeId);
	const counted = held?.channelId === channelId ? held : undefined;
	const [row] = (
		await materialsOfEpisode(executor, {
			channelId,
			episodeId,
			countedFingerprint: counted?.fingerprint ?? null
		})
	).rows;
	if (!row) throw episodeNotFound();
	return materialsOf(row, channelId, counted);
}

/** The gate materials of every episode of the channel not yet published, by publish date (undated last), in one query. */
export async function unpublishedGateMaterials(
	channelId: string,
	executor: Executor = db
): Promise<GateMaterials[]> {
	const counted = countedInChannel(channelId);
	const fingerprints = JSON.stringify(
		Object.fromEntries([...counted].map(([id, { fingerprint }]) => [id, fingerprint]))
	);
	const rows = await materialsQuery(
		executor,
		channelId,
		sql<string | null>`(${fingerprints}::jsonb ->> episode.id::text)`
	)
		.where('episode.stage', '!=', 'published')
		.orderBy(sql`episode.publish_date ASC NULLS LAST`)
		.execute();
	return Promise.all(rows.map((row) => materialsOf(row, channelId, counted.get(row.id))));
}
