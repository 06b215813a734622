import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { episodeDetail, updateEpisode } from '$lib/server/episodes/episodes';
import { stageReportFor } from '$lib/server/episodes/stage-moves';
import { scriptStateFor } from '$lib/server/episodes/script-reviews';
import { episodeUpdateSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

/** The episode, where it stands on the line (with its next gate), and its script's approval state. */
export const GET: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event);
	const episode = await episodeDetail(channel.id, event.params.id);
	const [stage, script] = await Promise.all([
		stageReportFor(channel.id, episode.id, { id: person.id, roles }),
		scriptStateFor(channel.id, episode.id)
	]);
	return json({ episode, stage, script });
});

/** A producer changes the details; send the version you read (409 with `current` when stale). */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event, 'producer');
	const input = await readJson(event, episodeUpdateSchema);
	return json({
		episode: await updateEpisode(
			channel.id,
			{ ...person, roles },
			event.params.id,
			input,
			event.url.origin
		)
	});
});
