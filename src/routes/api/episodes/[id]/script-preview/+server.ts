import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { episodeInChannel } from '$lib/server/episodes/episodes';
import { hostPaceFor } from '$lib/server/episodes/host-pace';
import { scriptHtmlAndWords } from '$lib/server/episodes/script-reader';
import { estimateSpokenSeconds } from '$lib/script/timing';
import { scriptPreviewSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

/**
 * The live preview: `{ markdown }` → sanitised HTML (marked, then sanitize-html), spoken words and
 * seconds at the episode host's pace. The browser cannot sanitise, so the editor posts here, debounced.
 * Both come from one read in a script-reader worker, within its time limit.
 */
export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const { markdown } = await readJson(event, scriptPreviewSchema);
	// The reads start at once, alongside the episode check (they touch no data and answer within
	// their time limit either way), so the answer is not their limit plus the queries.
	const reads = scriptHtmlAndWords(markdown);
	const episode = await episodeInChannel(channel.id, event.params.id);
	const [pace, { html, words }] = await Promise.all([hostPaceFor(channel.id, episode.id), reads]);
	return json({
		html,
		words,
		spokenSeconds: estimateSpokenSeconds(words, pace.wordsPerMinute),
		wordsPerMinute: pace.wordsPerMinute
	});
});
