import { requireRole, hasRole } from '$lib/server/auth/guard';
import { activeCrew } from '$lib/server/channel/crew';
import { listEpisodes } from '$lib/server/episodes/episode-list';
import { episodeListQuerySchema } from '$lib/schemas/episodes';
import { fieldIssues } from '$lib/server/http/api';
import type { PageServerLoad } from './$types';

/**
 * The episode list: filters and sort come from the query string, so a plain GET form drives them.
 * One page at a time; "More episodes" links to the page after the last row shown (`after`).
 */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	const raw = Object.fromEntries([...event.url.searchParams].filter(([, value]) => value !== ''));
	const parsed = episodeListQuerySchema.safeParse(raw);
	const query = parsed.success ? parsed.data : episodeListQuerySchema.parse({});
	const [page, crew] = await Promise.all([listEpisodes(channel.id, query), activeCrew(channel.id)]);
	// Written into the page again for hydration (devalue, per request, 50 rows): only what a row
	// shows, not the API's whole item (slug, version, creation time, each person's id).
	return {
		episodes: page.items.map((episode) => ({
			id: episode.id,
			title: episode.title,
			logline: episode.logline,
			stage: episode.stage,
			publishDate: episode.publishDate,
			targetRuntimeSeconds: episode.targetRuntimeSeconds,
			segmentCount: episode.segmentCount,
			plannedSeconds: episode.plannedSeconds,
			scriptShown: episode.scriptShown,
			builds: episode.builds.map(({ id, name }) => ({ id, name })),
			assignments: episode.assignments.map(({ role, name }) => ({ role, name }))
		})),
		next: page.next,
		query,
		filterErrors: parsed.success ? null : fieldIssues(parsed.error),
		crew: crew.filter((member) => member.roles.some((role) => role !== 'producer')),
		canCreate: hasRole(event.locals, 'producer')
	};
}) satisfies PageServerLoad;
