/**
 * The episode work waiting on each person's bench: scripts to write or rework for the host, scripts
 * to approve and episodes whose next gate now passes for the producer, shot lists to plan for the
 * camera operator, cautions to place for the editor. An episode counts for a person when they are
 * assigned its role, or when nobody is. Each role's list is one query, however many episodes the
 * channel has (tests/integration/query-counts.test.ts).
 */
import { sql } from 'kysely';
import { db } from '../db';
import type { Role } from '../db/types';
import type { WorkItem } from './worklist';
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { spokenWordsOfScript, unpublishedGateMaterials } from '../episodes/gate-snapshot';
import { gateChecksFor } from '$lib/gates';
import { counted } from '$lib/plural';
import { nextStage, STAGE_LABELS } from '$lib/stages';
import { scriptChangedSinceApproval } from '../episodes/script-status';
import { shownScriptStatus } from '$lib/script/status';

/** The episodes at these stages whose `role` is this person's or nobody's: a query to add columns to. */
function episodesFor(
	channelId: string,
	role: Role,
	personId: string | undefined,
	stages: string[]
) {
	return db
		.selectFrom('episode')
		.leftJoin('episodeAssignment', (join) =>
			join
				.onRef('episodeAssignment.episodeId', '=', 'episode.id')
				.on('episodeAssignment.role', '=', role)
		)
		.select([
			'episode.id',
			'episode.title',
			'episode.stage',
			'episode.scriptStatus',
			'episode.scriptApprovedFingerprint',
			scriptChangedSinceApproval().as('scriptChanged'),
			'episode.publishDate'
		])
		.where('episode.channelId', '=', channelId)
		.where('episode.stage', 'in', stages as never[])
		.$if(personId !== undefined, (query) =>
			query.where((eb) =>
				eb.or([
					eb('episodeAssignment.personId', '=', personId!),
					eb('episodeAssignment.personId', 'is', null)
				])
			)
		)
		.orderBy(sql`episode.publish_date ASC NULLS LAST`);
}

async function hostItems(channelId: string, personId: string | undefined): Promise<WorkItem[]> {
	const items: WorkItem[] = [];
	// One query for every episode: the latest comment a returned script came back with, and the
	// script's segments (their words are counted by the readers, remembered by fingerprint).
	const episodes = await episodesFor(channelId, 'host', personId, ['script'])
		.select((eb) => [
			eb
				.selectFrom('scriptReview')
				.select('scriptReview.body')
				.whereRef('scriptReview.episodeId', '=', 'episode.id')
				.where('scriptReview.kind', '=', 'returned')
				.orderBy('scriptReview.createdAt', 'desc')
				.limit(1)
				.as('returnedComment'),
			jsonArrayFrom(
				eb
					.selectFrom('segment')
					.innerJoin('segmentScript', 'segmentScript.segmentId', 'segment.id')
					.select(['segment.id', 'segmentScript.body'])
					.whereRef('segment.episodeId', '=', 'episode.id')
					.orderBy('segment.position')
			).as('scripts')
		])
		.execute();
	for (const episode of episodes) {
		const href = `/episodes/${episode.id}/script`;
		const shown = shownScriptStatus(episode.scriptStatus, episode.scriptChanged);
		if (shown === 'changed') {
			items.push({
				title: `Script changed since approval: ${episode.title}`,
				detail:
					'The text changed after the producer approved it: send it again from the script page.',
				href,
				tone: 'todo'
			});
			continue;
		}
		if (shown === 'returned') {
			const comment = episode.returnedComment;
			items.push({
				title: `Script returned with comments: ${episode.title}`,
				detail: comment
					? `“${comment.slice(0, 140)}${comment.length > 140 ? '…' : ''}”`
					: 'Read the comments, rework, and send it again.',
				href,
				tone: 'warn'
			});
			continue;
		}
		if (shown !== 'draft') continue;
		const scripts = episode.scripts;
		const written = (await spokenWordsOfScript(scripts)).filter((words) => words > 0).length;
		if (scripts.length === 0)
			items.push({
				title: `Rundown to plan: ${episode.title}`,
				detail: 'No segments yet: add them on the rundown, then write each one.',
				href: `/episodes/${episode.id}/rundown`,
				tone: 'todo'
			});
		else if (written < scripts.length)
			items.push({
				title: `Script to write: ${episode.title}`,
				detail: `${written} of ${counted(scripts.length, 'segment')} written.`,
				href,
				tone: 'todo'
			});
		else
			items.push({
				title: `Ready to send for approval: ${episode.title}`,
				detail: `${scripts.length === 1 ? 'The segment has' : `All ${scripts.length} segments have`} words. Send it to the producer from the script page.`,
				href,
				tone: 'todo'
			});
	}
	return items;
}

async function producerItems(channelId: string): Promise<WorkItem[]> {
	const items: WorkItem[] = [];
	// Every unpublished episode's gate snapshot in one query (gate-snapshot.ts).
	for (const episode of await unpublishedGateMaterials(channelId)) {
		const stage = episode.snapshot.stage;
		if (stage === 'script' && episode.scriptStatus === 'submitted') {
			items.push({
				title: `Script awaiting your approval: ${episode.title}`,
				detail: 'The host sent it: read it, then approve it or return it with comments.',
				href: `/episodes/${episode.id}/script`,
				tone: 'todo'
			});
		}
		const next = nextStage(stage);
		if (!next) continue;
		const reasons = gateChecksFor(episode.snapshot, next);
		if (reasons.length === 0) {
			items.push({
				title: `Ready for ${STAGE_LABELS[next]}: ${episode.title}`,
				detail: `Every gate check passes: move it on from ${STAGE_LABELS[stage]} when you are happy.`,
				href: `/episodes/${episode.id}`,
				tone: 'todo'
			});
		}
	}
	return items;
}

async function cameraItems(channelId: string, personId: string | undefined): Promise<WorkItem[]> {
	const items: WorkItem[] = [];
	const episodes = await episodesFor(channelId, 'camera', personId, ['script', 'shoot'])
		.select((eb) =>
			eb
				.selectFrom('segment')
				.select((inner) => inner.fn.countAll<number>().as('count'))
				.whereRef('segment.episodeId', '=', 'episode.id')
				.where('segment.needsFootage', '=', true)
				.where((inner) =>
					inner.not(
						inner.exists(
							inner
								.selectFrom('shot')
								.select('shot.id')
								.whereRef('shot.segmentId', '=', 'segment.id')
						)
					)
				)
				.as('count')
		)
		.execute();
	for (const episode of episodes) {
		const count = Number(episode.count ?? 0);
		if (count > 0) {
			items.push({
				title: `Shot list to plan: ${episode.title}`,
				detail: `${count} segment${count === 1 ? ' needs' : 's need'} footage but ${count === 1 ? 'has' : 'have'} no shots yet.`,
				href: `/episodes/${episode.id}/shots`,
				tone: episode.stage === 'shoot' ? 'warn' : 'todo'
			});
		}
	}
	return items;
}

async function editorItems(channelId: string, personId: string | undefined): Promise<WorkItem[]> {
	const items: WorkItem[] = [];
	const episodes = await episodesFor(channelId, 'editor', personId, ['edit', 'locked'])
		.select((eb) =>
			eb
				.selectFrom('caution')
				.innerJoin('segment', 'segment.id', 'caution.segmentId')
				.select((inner) => inner.fn.countAll<number>().as('count'))
				.whereRef('segment.episodeId', '=', 'episode.id')
				.where('caution.atFrame', 'is', null)
				.where(sql<boolean>`caution.hazard = ANY(segment.hazards)`)
				.as('count')
		)
		.execute();
	for (const episode of episodes) {
		const count = Number(episode.count ?? 0);
		if (count > 0) {
			items.push({
				title: `Cautions to place: ${episode.title}`,
				detail: `${count} caution card${count === 1 ? ' is' : 's are'} not placed in the cut yet: the lock gate waits for ${count === 1 ? 'it' : 'them'}.`,
				href: `/episodes/${episode.id}/rundown`,
				tone: 'warn'
			});
		}
	}
	return items;
}

/** Bench items from episode work, by role; merge them into the bench's sections. */
export async function episodeWorklistFor(
	channelId: string,
	roles: readonly Role[],
	personId?: string
): Promise<Partial<Record<Role, WorkItem[]>>> {
	const [host, producer, camera, editor] = await Promise.all([
		roles.includes('host') ? hostItems(channelId, personId) : [],
		roles.includes('producer') ? producerItems(channelId) : [],
		roles.includes('camera') ? cameraItems(channelId, personId) : [],
		roles.includes('editor') ? editorItems(channelId, personId) : []
	]);
	return { host, producer, camera, editor };
}
