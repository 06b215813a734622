/**
 * The episode work waiting on each person's bench: scripts to write or rework for the host, scripts
 * to approve and episodes whose next gate now passes for the producer, shot lists to plan for the
 * camera operator, cautions to place for the editor. An episode counts for a person when they are
 * assigned its role, or when nobody is.
 */
import { sql } from 'kysely';
import { db } from '../db';
import type { Role } from '../db/types';
import type { WorkItem } from './worklist';
import { gateSnapshotFor } from '../episodes/stage-moves';
import { gateChecksFor } from '$lib/gates';
import { counted } from '$lib/plural';
import { spokenWordsEach } from '../episodes/script-reader';
import { nextStage, STAGE_LABELS } from '$lib/stages';
import { scriptChangedSinceApproval } from '../episodes/script-status';
import { shownScriptStatus } from '$lib/script/status';

async function episodesFor(
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
		.orderBy(sql`episode.publish_date ASC NULLS LAST`)
		.execute();
}

async function hostItems(channelId: string, personId: string | undefined): Promise<WorkItem[]> {
	const items: WorkItem[] = [];
	for (const episode of await episodesFor(channelId, 'host', personId, ['script'])) {
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
			const comment = await db
				.selectFrom('scriptReview')
				.select('body')
				.where('episodeId', '=', episode.id)
				.where('kind', '=', 'returned')
				.orderBy('createdAt', 'desc')
				.limit(1)
				.executeTakeFirst();
			items.push({
				title: `Script returned with comments: ${episode.title}`,
				detail: comment?.body
					? `“${comment.body.slice(0, 140)}${comment.body.length > 140 ? '…' : ''}”`
					: 'Read the comments, rework, and send it again.',
				href,
				tone: 'warn'
			});
			continue;
		}
		if (shown !== 'draft') continue;
		const scripts = await db
			.selectFrom('segment')
			.innerJoin('segmentScript', 'segmentScript.segmentId', 'segment.id')
			.select('segmentScript.body')
			.where('segment.episodeId', '=', episode.id)
			.execute();
		const written = (await spokenWordsEach(scripts.map((script) => script.body))).filter(
			(words) => words > 0
		).length;
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
	const episodes = await db
		.selectFrom('episode')
		.select(['id', 'title', 'stage', 'scriptStatus'])
		.where('channelId', '=', channelId)
		.where('stage', '!=', 'published')
		.orderBy(sql`publish_date ASC NULLS LAST`)
		.execute();
	const items: WorkItem[] = [];
	for (const episode of episodes) {
		if (episode.stage === 'script' && episode.scriptStatus === 'submitted') {
			items.push({
				title: `Script awaiting your approval: ${episode.title}`,
				detail: 'The host sent it: read it, then approve it or return it with comments.',
				href: `/episodes/${episode.id}/script`,
				tone: 'todo'
			});
		}
		const next = nextStage(episode.stage);
		if (!next) continue;
		const reasons = gateChecksFor(await gateSnapshotFor(channelId, episode.id), next);
		if (reasons.length === 0) {
			items.push({
				title: `Ready for ${STAGE_LABELS[next]}: ${episode.title}`,
				detail: `Every gate check passes: move it on from ${STAGE_LABELS[episode.stage]} when you are happy.`,
				href: `/episodes/${episode.id}`,
				tone: 'todo'
			});
		}
	}
	return items;
}

async function cameraItems(channelId: string, personId: string | undefined): Promise<WorkItem[]> {
	const items: WorkItem[] = [];
	for (const episode of await episodesFor(channelId, 'camera', personId, ['script', 'shoot'])) {
		const { count } = await db
			.selectFrom('segment')
			.select((eb) => eb.fn.countAll<number>().as('count'))
			.where('segment.episodeId', '=', episode.id)
			.where('segment.needsFootage', '=', true)
			.where((eb) =>
				eb.not(
					eb.exists(
						eb.selectFrom('shot').select('shot.id').whereRef('shot.segmentId', '=', 'segment.id')
					)
				)
			)
			.executeTakeFirstOrThrow();
		if (Number(count) > 0) {
			items.push({
				title: `Shot list to plan: ${episode.title}`,
				detail: `${count} segment${Number(count) === 1 ? ' needs' : 's need'} footage but ${Number(count) === 1 ? 'has' : 'have'} no shots yet.`,
				href: `/episodes/${episode.id}/shots`,
				tone: episode.stage === 'shoot' ? 'warn' : 'todo'
			});
		}
	}
	return items;
}

async function editorItems(channelId: string, personId: string | undefined): Promise<WorkItem[]> {
	const items: WorkItem[] = [];
	for (const episode of await episodesFor(channelId, 'editor', personId, ['edit', 'locked'])) {
		const { count } = await db
			.selectFrom('caution')
			.innerJoin('segment', 'segment.id', 'caution.segmentId')
			.select((eb) => eb.fn.countAll<number>().as('count'))
			.where('segment.episodeId', '=', episode.id)
			.where('caution.atFrame', 'is', null)
			.where(sql<boolean>`caution.hazard = ANY(segment.hazards)`)
			.executeTakeFirstOrThrow();
		if (Number(count) > 0) {
			items.push({
				title: `Cautions to place: ${episode.title}`,
				detail: `${count} caution card${Number(count) === 1 ? ' is' : 's are'} not placed in the cut yet: the lock gate waits for ${Number(count) === 1 ? 'it' : 'them'}.`,
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
