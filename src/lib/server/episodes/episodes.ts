/**
 * Episodes: the details (title, slug, runtime, frame rate, publish date, builds featured, crew per
 * role), creating and changing them. The list is in episode-list.ts, the crew rules in
 * episode-crew.ts, the host's speaking pace in host-pace.ts. Every function takes the channel id and
 * filters by it: another channel's episode is "not found".
 */
import { type ExpressionBuilder, type Kysely } from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import { compiledOnce } from '../db/compiled-once';
import type { Database, Role } from '../db/types';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { scriptChangedSinceApproval } from './script-status';
import { shownScriptStatus } from '$lib/script/status';
import { activeCrewSelect } from '../channel/crew';
import { checkAssignments, writeAssignments } from './episode-crew';
import { checkedProgrammeTimecode } from './programme-timecode';
import type { Stage } from '$lib/stages';
import { isDropFrameCapable, type FrameRate } from '$lib/timecode';
import type { EpisodeCreate, EpisodeUpdate } from '$lib/schemas/episodes';

/** The shared instance or an open transaction (a Transaction is a Kysely). */
export type Executor = Kysely<Database>;

export interface Actor {
	id: string;
	name: string;
	roles: readonly Role[];
}

/** What a page about one episode's time shows at its top: the episode and how its time is counted. */
export interface EpisodeHeading {
	id: string;
	title: string;
	slug: string;
	stage: string;
	frameRate: FrameRate;
	/** Drop-frame programme timecode (only possible at 29.97 and 59.94). */
	dropFrame: boolean;
	/** The label of the cut's first frame, e.g. 01:00:00:00 (`programmeClock` in $lib/timecode). */
	timecodeStart: string;
}

export const episodeNotFound = () =>
	notFound('That episode', 'If it belongs to another channel, switch channel first.');

/** The episode row of this channel, optionally locked for the rest of the transaction; 404 otherwise. */
export async function episodeInChannel(
	channelId: string,
	episodeId: string,
	executor: Executor = db,
	options: { lock?: boolean } = {}
) {
	if (!isUuid(episodeId)) throw episodeNotFound();
	let query = executor
		.selectFrom('episode')
		.selectAll()
		.where('id', '=', episodeId)
		.where('channelId', '=', channelId);
	if (options.lock) query = query.forUpdate();
	const row = await query.executeTakeFirst();
	if (!row) throw episodeNotFound();
	return row;
}

/**
 * An episode's crew (role, person id, name, in role order) as a JSON array named `assignments`, for a
 * select over `episode`: Kysely's relations recipe (`jsonArrayFrom`). `extra` adds columns.
 */
export function withAssignments<Extra extends 'person.email' = never>(
	eb: ExpressionBuilder<Database, 'episode'>,
	extra: readonly Extra[] = []
) {
	return jsonArrayFrom(
		eb
			.selectFrom('episodeAssignment')
			.innerJoin('person', 'person.id', 'episodeAssignment.personId')
			.select(['episodeAssignment.role', 'person.id as personId', 'person.name', ...extra])
			.whereRef('episodeAssignment.episodeId', '=', 'episode.id')
			.orderBy('episodeAssignment.role')
	).as('assignments');
}

/**
 * The builds an episode features (id, name, by name) as a JSON array named `builds`, for a select
 * over `episode`, the same way as withAssignments. `extra` adds columns.
 */
export function withBuilds<Extra extends 'build.year' | 'build.vehicleType' = never>(
	eb: ExpressionBuilder<Database, 'episode'>,
	extra: readonly Extra[] = []
) {
	return jsonArrayFrom(
		eb
			.selectFrom('episodeBuild')
			.innerJoin('build', 'build.id', 'episodeBuild.buildId')
			.select(['build.id', 'build.name', ...extra])
			.whereRef('episodeBuild.episodeId', '=', 'episode.id')
			.orderBy('build.name')
	).as('builds');
}

/** The episode's details: read on every episode page and API call, so compiled once. */
const episodeDetailQuery = compiledOnce(['channelId', 'episodeId'], ({ channelId, episodeId }) =>
	db
		.selectFrom('episode')
		.leftJoin('person as approver', 'approver.id', 'episode.scriptApprovedBy')
		.select((eb) => [
			'episode.id',
			'episode.title',
			'episode.slug',
			'episode.logline',
			'episode.targetRuntimeSeconds',
			'episode.frameRate',
			'episode.timecodeDropFrame',
			'episode.timecodeStart',
			'episode.publishDate',
			'episode.stage',
			'episode.cutDurationFrames',
			'episode.scriptStatus',
			'episode.scriptApprovedFingerprint',
			'episode.scriptFingerprint',
			scriptChangedSinceApproval().as('scriptChanged'),
			'episode.scriptApprovedAt',
			'approver.name as scriptApprovedByName',
			'episode.version',
			'episode.createdAt',
			withAssignments(eb, ['person.email']),
			withBuilds(eb, ['build.year', 'build.vehicleType'])
		])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
);

/**
 * One episode with its builds and crew, and the fingerprint of its script as saved now (the
 * column the database keeps, script-status.ts), in one query; 404 otherwise.
 */
export async function episodeDetailAndScriptFingerprint(
	channelId: string,
	episodeId: string,
	executor: Executor = db
) {
	if (!isUuid(episodeId)) throw episodeNotFound();
	const [row] = (await episodeDetailQuery(executor, { channelId, episodeId })).rows;
	if (!row) throw episodeNotFound();
	const { scriptChanged, scriptFingerprint, ...detail } = row;
	return {
		episode: { ...detail, scriptShown: shownScriptStatus(row.scriptStatus, scriptChanged) },
		scriptFingerprint
	};
}

/** One episode with its builds and crew, for the episode pages and GET /api/episodes/[id]. */
export async function episodeDetail(channelId: string, episodeId: string, executor: Executor = db) {
	return (await episodeDetailAndScriptFingerprint(channelId, episodeId, executor)).episode;
}

export type EpisodeDetail = Awaited<ReturnType<typeof episodeDetail>>;

/**
 * What the episode forms offer: the channel's builds and its active crew with their roles. Other
 * episodes are not loaded here: a form that links one asks the picker (episode-picker.ts). One
 * query (two aggregates), read on every episode page a producer opens, so compiled once
 * (db/compiled-once.ts).
 */
const formOptionsQuery = compiledOnce(['channelId'], ({ channelId }) =>
	db.selectNoFrom((eb) => [
		jsonArrayFrom(
			eb
				.selectFrom('build')
				.select(['build.id', 'build.name', 'build.year', 'build.vehicleType'])
				.where('build.channelId', '=', channelId)
				.orderBy('build.name')
		).as('builds'),
		jsonArrayFrom(activeCrewSelect(channelId)).as('crew')
	])
);

export async function episodeFormOptions(channelId: string) {
	const [options] = (await formOptionsQuery(db, { channelId })).rows;
	return options;
}

/** A URL slug from a title: lower case, ASCII letters and digits joined by single hyphens. */
export function slugFromTitle(title: string): string {
	const slug = title
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '')
		.slice(0, 60)
		.replace(/-+$/, '');
	return slug || 'episode';
}

async function uniqueSlug(
	executor: Executor,
	channelId: string,
	wanted: string,
	exceptEpisodeId?: string
): Promise<string> {
	const taken = new Set(
		(
			await executor
				.selectFrom('episode')
				.select('slug')
				.where('channelId', '=', channelId)
				.where('slug', 'like', `${wanted}%`)
				.$if(exceptEpisodeId !== undefined, (query) => query.where('id', '!=', exceptEpisodeId!))
				.execute()
		).map((row) => row.slug)
	);
	if (!taken.has(wanted)) return wanted;
	for (let suffix = 2; ; suffix++)
		if (!taken.has(`${wanted}-${suffix}`)) return `${wanted}-${suffix}`;
}

async function checkBuilds(
	executor: Executor,
	channelId: string,
	buildIds: readonly string[]
): Promise<void> {
	if (buildIds.length === 0) return;
	const found = await executor
		.selectFrom('build')
		.select('id')
		.where('channelId', '=', channelId)
		.where('id', 'in', [...buildIds])
		.execute();
	if (found.length !== new Set(buildIds).size) {
		throw new DomainError(400, 'One of the builds is not in this channel.', {
			buildIds: ['Pick builds from the list.']
		});
	}
}

/** Creates an episode at the script stage, with its first history row; mails whoever is assigned. */
export async function createEpisode(
	channelId: string,
	actor: Actor,
	input: EpisodeCreate,
	origin: string
) {
	return db.transaction().execute(async (trx) => {
		await checkBuilds(trx, channelId, input.buildIds ?? []);
		await checkAssignments(trx, channelId, input.assignments ?? {});
		const slug = input.slug
			? input.slug
			: await uniqueSlug(trx, channelId, slugFromTitle(input.title));
		const clash = await trx
			.selectFrom('episode')
			.select('id')
			.where('channelId', '=', channelId)
			.where('slug', '=', slug)
			.executeTakeFirst();
		if (clash)
			throw new DomainError(
				409,
				`Another episode already uses the slug “${slug}”. Pick another, or leave it empty to make one from the title.`,
				{ slug: ['Already used by another episode.'] }
			);
		const timecode = checkedProgrammeTimecode(
			input.frameRate,
			input.timecodeDropFrame ?? null,
			input.timecodeStart ?? '00:00:00:00'
		);
		const episode = await trx
			.insertInto('episode')
			.values({
				channelId,
				title: input.title,
				slug,
				logline: input.logline ?? '',
				targetRuntimeSeconds: input.targetRuntimeSeconds,
				frameRate: input.frameRate,
				...timecode,
				publishDate: input.publishDate ?? null,
				stage: 'script'
			})
			.returning(['id', 'title'])
			.executeTakeFirstOrThrow();
		for (const buildId of new Set(input.buildIds ?? []))
			await trx.insertInto('episodeBuild').values({ episodeId: episode.id, buildId }).execute();
		await writeAssignments(
			trx,
			{ channelId, episodeId: episode.id, episodeTitle: episode.title, actor, origin },
			input.assignments ?? {}
		);
		await trx
			.insertInto('stageMove')
			.values({
				episodeId: episode.id,
				personId: actor.id,
				fromStage: null,
				toStage: 'script',
				note: 'Episode created'
			})
			.execute();
		return episodeDetail(channelId, episode.id, trx);
	});
}

/** Changes an episode's details; a stale version answers 409 with the saved episode in `current`. */
export async function updateEpisode(
	channelId: string,
	actor: Actor,
	episodeId: string,
	input: EpisodeUpdate,
	origin: string
) {
	return db.transaction().execute(async (trx) => {
		const episode = await episodeInChannel(channelId, episodeId, trx, { lock: true });
		if (episode.version !== input.version) {
			throw new DomainError(
				409,
				'Someone saved this episode while you were editing. Their version is shown below; your changes are still in the form.',
				undefined,
				{
					current: await episodeDetail(channelId, episodeId, trx)
				}
			);
		}
		if (
			input.frameRate !== undefined &&
			input.frameRate !== episode.frameRate &&
			episode.stage !== 'script'
		) {
			throw new DomainError(
				409,
				'The frame rate is fixed once the episode has left the script stage: takes, cautions and the cut are counted in its frames.',
				{ frameRate: ['Fixed after the script stage.'] }
			);
		}
		// The timecode form and start only change how positions are labelled (positions are frames
		// from the start of the cut), so they stay editable at every stage.
		const frameRate = input.frameRate ?? episode.frameRate;
		const timecode = checkedProgrammeTimecode(
			frameRate,
			input.timecodeDropFrame !== undefined
				? input.timecodeDropFrame
				: isDropFrameCapable(frameRate)
					? episode.timecodeDropFrame
					: null,
			input.timecodeStart ?? episode.timecodeStart
		);
		if (input.buildIds) await checkBuilds(trx, channelId, input.buildIds);
		if (input.assignments) await checkAssignments(trx, channelId, input.assignments);
		let slug = episode.slug;
		if (input.slug !== undefined && input.slug !== episode.slug) {
			slug =
				input.slug === ''
					? await uniqueSlug(trx, channelId, slugFromTitle(input.title ?? episode.title), episodeId)
					: input.slug;
			const clash = await trx
				.selectFrom('episode')
				.select('id')
				.where('channelId', '=', channelId)
				.where('slug', '=', slug)
				.where('id', '!=', episodeId)
				.executeTakeFirst();
			if (clash)
				throw new DomainError(
					409,
					`Another episode already uses the slug “${slug}”. Pick another.`,
					{ slug: ['Already used by another episode.'] }
				);
		}
		const title = input.title ?? episode.title;
		await trx
			.updateTable('episode')
			.set({
				title,
				slug,
				logline: input.logline ?? episode.logline,
				targetRuntimeSeconds: input.targetRuntimeSeconds ?? episode.targetRuntimeSeconds,
				frameRate,
				...timecode,
				publishDate: input.publishDate === undefined ? episode.publishDate : input.publishDate,
				version: episode.version + 1
			})
			.where('id', '=', episodeId)
			.execute();
		if (input.buildIds) {
			await trx.deleteFrom('episodeBuild').where('episodeId', '=', episodeId).execute();
			for (const buildId of new Set(input.buildIds))
				await trx.insertInto('episodeBuild').values({ episodeId, buildId }).execute();
		}
		if (input.assignments)
			await writeAssignments(
				trx,
				{ channelId, episodeId, episodeTitle: title, actor, origin },
				input.assignments
			);
		return episodeDetail(channelId, episodeId, trx);
	});
}

/** Stage of an episode as a typed value. */
export function stageOf(episode: { stage: string }): Stage {
	return episode.stage as Stage;
}
