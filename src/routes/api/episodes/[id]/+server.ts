import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { episodeDetail, updateEpisode } from '$lib/server/episodes/episodes';
import { gateMaterialsFor } from '$lib/server/episodes/gate-snapshot';
import { stageReportOf } from '$lib/server/episodes/stage-moves';
import { scriptStateOf } from '$lib/server/episodes/script-reviews';
import { episodeUpdateSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

/** The episode, where it stands on the line (with its next gate), and its script's approval state. */
export const GET: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event);
	// Two queries however big the episode: the episode, and everything its gate reads.
	const [episode, materials] = await Promise.all([
		episodeDetail(channel.id, event.params.id),
		gateMaterialsFor(channel.id, event.params.id)
	]);
	return json({
		episode,
		stage: stageReportOf(materials, { id: person.id, roles }),
		script: scriptStateOf(episode, materials.snapshot.script.currentFingerprint)
	});
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
