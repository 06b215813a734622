/**
 * Episodes: the list a producer filters, the details (title, slug, runtime, frame rate, publish
 * date, builds featured, crew per role), and the host's speaking pace. Every function takes the
 * channel id and filters by it: another channel's episode is "not found".
 */
import { sql, type Kysely } from 'kysely';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import type { Database, Role } from '../db/types';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import { queueMail } from '../mail/outbox';
import { assignmentMail } from '../mail/episode-messages';
import { calibratePace, DEFAULT_WORDS_PER_MINUTE, type CalibratedPace } from '$lib/script/timing';
import { spokenWordsEach } from './script-reader';
import { framesToSeconds } from '$lib/timecode';
import { STAGES, type Stage } from '$lib/stages';
import {
	ASSIGNABLE_ROLES,
	type AssignableRole,
	type EpisodeCreate,
	type EpisodeListQuery,
	type EpisodeUpdate
} from '$lib/schemas/episodes';
import { ROLE_LABELS } from '$lib/roles';

/** The shared instance or an open transaction (a Transaction is a Kysely). */
export type Executor = Kysely<Database>;

export interface Actor {
	id: string;
	name: string;
	roles: readonly Role[];
}

export const episodeNotFound = () =>
	notFound('That episode', 'If it belongs to another channel, switch channel first.');

/** The episode row of this channel, optionally locked for the rest of the transaction; 404 otherwise. */
export async function episodeInChannel(
	executor: Executor,
	channelId: string,
	episodeId: string,
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

const stageOrder = sql<number>`array_position(ARRAY[${sql.join(STAGES.map((stage) => sql.lit(stage)))}]::text[], episode.stage)`;

/** The episode list with filters and sort; each row carries what the list shows at a glance. */
export async function listEpisodes(channelId: string, query: EpisodeListQuery) {
	let select = db
		.selectFrom('episode')
		.select((eb) => [
			'episode.id',
			'episode.title',
			'episode.slug',
			'episode.logline',
			'episode.stage',
			'episode.publishDate',
			'episode.targetRuntimeSeconds',
			'episode.scriptStatus',
			'episode.createdAt',
			'episode.version',
			jsonArrayFrom(
				eb
					.selectFrom('episodeAssignment')
					.innerJoin('person', 'person.id', 'episodeAssignment.personId')
					.select(['episodeAssignment.role', 'person.id as personId', 'person.name'])
					.whereRef('episodeAssignment.episodeId', '=', 'episode.id')
					.orderBy('episodeAssignment.role')
			).as('assignments'),
			jsonArrayFrom(
				eb
					.selectFrom('episodeBuild')
					.innerJoin('build', 'build.id', 'episodeBuild.buildId')
					.select(['build.id', 'build.name'])
					.whereRef('episodeBuild.episodeId', '=', 'episode.id')
					.orderBy('build.name')
			).as('builds'),
			eb
				.selectFrom('segment')
				.select((inner) => inner.fn.countAll<number>().as('count'))
				.whereRef('segment.episodeId', '=', 'episode.id')
				.as('segmentCount'),
			eb
				.selectFrom('segment')
				.select((inner) =>
					inner.fn
						.coalesce(inner.fn.sum<number>('segment.plannedSeconds'), sql<number>`0`)
						.as('planned')
				)
				.whereRef('segment.episodeId', '=', 'episode.id')
				.as('plannedSeconds')
		])
		.where('episode.channelId', '=', channelId);
	if (query.stage) select = select.where('episode.stage', '=', query.stage);
	if (query.assignee) {
		const assignee = query.assignee;
		select = select.where((eb) =>
			eb.exists(
				eb
					.selectFrom('episodeAssignment')
					.select('episodeAssignment.role')
					.whereRef('episodeAssignment.episodeId', '=', 'episode.id')
					.where('episodeAssignment.personId', '=', assignee)
			)
		);
	}
	if (query.from) select = select.where('episode.publishDate', '>=', query.from);
	if (query.to) select = select.where('episode.publishDate', '<=', query.to);
	const direction = query.direction;
	const nulls = sql.raw(direction === 'asc' ? 'NULLS LAST' : 'NULLS FIRST');
	switch (query.sort) {
		case 'title':
			select = select.orderBy(sql`lower(episode.title) ${sql.raw(direction)}`);
			break;
		case 'stage':
			select = select
				.orderBy(sql`${stageOrder} ${sql.raw(direction)}`)
				.orderBy('episode.publishDate', (order) => order.asc().nullsLast());
			break;
		case 'created':
			select = select.orderBy('episode.createdAt', direction);
			break;
		default:
			select = select.orderBy(sql`episode.publish_date ${sql.raw(direction)} ${nulls}`);
	}
	const rows = await select.orderBy('episode.title').orderBy('episode.id').execute();
	return rows.map((row) => ({
		...row,
		segmentCount: Number(row.segmentCount ?? 0),
		plannedSeconds: Number(row.plannedSeconds ?? 0)
	}));
}

export type EpisodeListRow = Awaited<ReturnType<typeof listEpisodes>>[number];

/** One episode with its builds and crew, for the episode pages and GET /api/episodes/[id]. */
export async function episodeDetail(channelId: string, episodeId: string, executor: Executor = db) {
	if (!isUuid(episodeId)) throw episodeNotFound();
	const row = await executor
		.selectFrom('episode')
		.leftJoin('person as approver', 'approver.id', 'episode.scriptApprovedBy')
		.select((eb) => [
			'episode.id',
			'episode.title',
			'episode.slug',
			'episode.logline',
			'episode.targetRuntimeSeconds',
			'episode.frameRate',
			'episode.publishDate',
			'episode.stage',
			'episode.cutDurationFrames',
			'episode.scriptStatus',
			'episode.scriptApprovedFingerprint',
			'episode.scriptApprovedAt',
			'approver.name as scriptApprovedByName',
			'episode.version',
			'episode.createdAt',
			jsonArrayFrom(
				eb
					.selectFrom('episodeAssignment')
					.innerJoin('person', 'person.id', 'episodeAssignment.personId')
					.select([
						'episodeAssignment.role',
						'person.id as personId',
						'person.name',
						'person.email'
					])
					.whereRef('episodeAssignment.episodeId', '=', 'episode.id')
					.orderBy('episodeAssignment.role')
			).as('assignments'),
			jsonArrayFrom(
				eb
					.selectFrom('episodeBuild')
					.innerJoin('build', 'build.id', 'episodeBuild.buildId')
					.select(['build.id', 'build.name', 'build.year', 'build.vehicleType'])
					.whereRef('episodeBuild.episodeId', '=', 'episode.id')
					.orderBy('build.name')
			).as('builds')
		])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.executeTakeFirst();
	if (!row) throw episodeNotFound();
	return row;
}

export type EpisodeDetail = Awaited<ReturnType<typeof episodeDetail>>;

/** Role → person id of an episode's crew. */
export function assignmentMap(
	assignments: readonly { role: string; personId: string }[]
): Partial<Record<Role, string>> {
	return Object.fromEntries(
		assignments.map((assignment) => [assignment.role, assignment.personId])
	);
}

/** What the episode forms offer: the channel's builds and its active crew with their roles. */
export async function episodeFormOptions(channelId: string) {
	const [builds, crew, episodes] = await Promise.all([
		db
			.selectFrom('build')
			.select(['id', 'name', 'year', 'vehicleType'])
			.where('channelId', '=', channelId)
			.orderBy('name')
			.execute(),
		db
			.selectFrom('membership')
			.innerJoin('person', 'person.id', 'membership.personId')
			.select(['person.id', 'person.name', 'membership.roles'])
			.where('membership.channelId', '=', channelId)
			.where('membership.disabledAt', 'is', null)
			.orderBy('person.name')
			.execute(),
		db
			.selectFrom('episode')
			.select(['id', 'title', 'stage'])
			.where('channelId', '=', channelId)
			.orderBy('title')
			.execute()
	]);
	return { builds, crew, episodes };
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

/** Every assignee must be an active crew member holding that role in this channel. */
async function checkAssignments(
	executor: Executor,
	channelId: string,
	assignments: Partial<Record<AssignableRole, string | null>>
): Promise<void> {
	const wanted = Object.entries(assignments).filter(
		(entry): entry is [AssignableRole, string] => typeof entry[1] === 'string'
	);
	if (wanted.length === 0) return;
	const members = await executor
		.selectFrom('membership')
		.select(['personId', 'roles'])
		.where('channelId', '=', channelId)
		.where('disabledAt', 'is', null)
		.where(
			'personId',
			'in',
			wanted.map(([, personId]) => personId)
		)
		.execute();
	const issues: Record<string, string[]> = {};
	for (const [role, personId] of wanted) {
		const member = members.find((candidate) => candidate.personId === personId);
		if (!member) issues[`assignments.${role}`] = ['That person is not on this channel’s crew.'];
		else if (!member.roles.includes(role))
			issues[`assignments.${role}`] = [
				`That person does not have the ${ROLE_LABELS[role].toLowerCase()} role: give it to them under Crew first.`
			];
	}
	if (Object.keys(issues).length)
		throw new DomainError(400, 'Some crew assignments need fixing.', issues);
}

/** Replaces the assignments named in `assignments` (null removes one); mails anyone newly assigned. */
async function writeAssignments(
	trx: Executor,
	context: {
		channelId: string;
		episodeId: string;
		episodeTitle: string;
		actor: Actor;
		origin: string;
	},
	assignments: Partial<Record<AssignableRole, string | null | undefined>>
): Promise<void> {
	const before = assignmentMap(
		await trx
			.selectFrom('episodeAssignment')
			.select(['role', 'personId'])
			.where('episodeId', '=', context.episodeId)
			.execute()
	);
	for (const role of ASSIGNABLE_ROLES) {
		if (!(role in assignments) || assignments[role] === undefined) continue;
		const personId = assignments[role] ?? null;
		if (before[role] === personId) continue;
		await trx
			.deleteFrom('episodeAssignment')
			.where('episodeId', '=', context.episodeId)
			.where('role', '=', role)
			.execute();
		if (personId === null) continue;
		await trx
			.insertInto('episodeAssignment')
			.values({ episodeId: context.episodeId, role, personId })
			.execute();
		if (personId === context.actor.id) continue;
		const person = await trx
			.selectFrom('person')
			.select(['email', 'name'])
			.where('id', '=', personId)
			.executeTakeFirstOrThrow();
		await queueMail(trx, {
			to: person.email,
			channelId: context.channelId,
			...assignmentMail({
				personName: person.name,
				assignerName: context.actor.name,
				role: ROLE_LABELS[role],
				episodeTitle: context.episodeTitle,
				link: `${context.origin}/episodes/${context.episodeId}`
			})
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
		const episode = await trx
			.insertInto('episode')
			.values({
				channelId,
				title: input.title,
				slug,
				logline: input.logline ?? '',
				targetRuntimeSeconds: input.targetRuntimeSeconds,
				frameRate: input.frameRate,
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
		const episode = await episodeInChannel(trx, channelId, episodeId, { lock: true });
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
				frameRate: input.frameRate ?? episode.frameRate,
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

export interface HostPace extends CalibratedPace {
	hostName: string | null;
}

/**
 * The assigned host's pace: words ÷ recorded minutes over their earlier segments whose length in
 * the cut is known (calibratePace in $lib/script/timing), else the 150 wpm default.
 */
export async function hostPaceFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<HostPace> {
	const host = await executor
		.selectFrom('episodeAssignment')
		.innerJoin('person', 'person.id', 'episodeAssignment.personId')
		.select(['person.id', 'person.name'])
		.where('episodeAssignment.episodeId', '=', episodeId)
		.where('episodeAssignment.role', '=', 'host')
		.executeTakeFirst();
	if (!host)
		return {
			wordsPerMinute: DEFAULT_WORDS_PER_MINUTE,
			basedOn: 0,
			calibrated: false,
			hostName: null
		};
	const recorded = await executor
		.selectFrom('segment')
		.innerJoin('episode', 'episode.id', 'segment.episodeId')
		.innerJoin('episodeAssignment', (join) =>
			join
				.onRef('episodeAssignment.episodeId', '=', 'episode.id')
				.on('episodeAssignment.role', '=', 'host')
		)
		.innerJoin('segmentScript', 'segmentScript.segmentId', 'segment.id')
		.select(['segment.recordedFrames', 'episode.frameRate', 'segmentScript.body'])
		.where('episode.channelId', '=', channelId)
		.where('episodeAssignment.personId', '=', host.id)
		.where('segment.recordedFrames', 'is not', null)
		.execute();
	const words = await spokenWordsEach(recorded.map((row) => row.body));
	const samples = recorded.map((row, index) => ({
		words: words[index],
		recordedSeconds: framesToSeconds(row.recordedFrames!, row.frameRate)
	}));
	return { ...calibratePace(samples), hostName: host.name };
}

/** Stage of an episode as a typed value. */
export function stageOf(episode: { stage: string }): Stage {
	return episode.stage as Stage;
}
