import { error } from '@sveltejs/kit';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import { assertSegmentOfEpisode } from '$lib/server/episodes/segment-in-channel';
import { rundownFor } from '$lib/server/episodes/rundown';
import { saveScript } from '$lib/server/episodes/script-saves';
import { scriptHtml, spokenWords } from '$lib/server/episodes/script-reader';
import { reviewsFor } from '$lib/server/episodes/script-reviews';
import { SCRIPT_CHARACTER_LIMIT, scriptSaveSchema } from '$lib/schemas/episodes';
import { attempt, forPage, runForm, text } from '$lib/server/http/forms';
import { stageLock, type Stage } from '$lib/stages';
import type { Actions, PageServerLoad } from './$types';

/** One segment's script editor, with what the live timing needs: the pace and the rest of the episode's spoken time. */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	// The stage's lock takes the editor away (the layout says why).
	const open = stageLock((await event.parent()).episodeHeader.stage as Stage, 'script') === null;
	const rundown = await forPage(rundownFor(channel.id, event.params.id));
	const index = rundown.segments.findIndex((segment) => segment.id === event.params.segmentId);
	if (index === -1) error(404, 'That segment is not in this episode.');
	const segment = rundown.segments[index];
	const [reviews, previewHtml] = await Promise.all([
		reviewsFor(channel.id, event.params.id),
		scriptHtml(segment.script.body)
	]);
	// The producer's comments on this segment, so the host reads them where they write.
	const comments = reviews.filter(
		(review) => review.segmentId === segment.id && review.body.trim()
	);
	return {
		comments,
		episode: rundown.episode,
		pace: rundown.pace,
		segment,
		count: rundown.segments.length,
		previous: rundown.segments[index - 1]
			? { id: rundown.segments[index - 1].id, title: rundown.segments[index - 1].title }
			: null,
		next: rundown.segments[index + 1]
			? { id: rundown.segments[index + 1].id, title: rundown.segments[index + 1].title }
			: null,
		otherSpokenSeconds: rundown.totals.spokenSeconds - segment.spokenSeconds,
		// The planned time of the other spoken segments (the editor counts this one as spoken).
		otherSpokenPlannedSeconds:
			rundown.totals.spokenPlannedSeconds - (segment.words > 0 ? segment.plannedSeconds : 0),
		previewHtml,
		canWrite: open && hasRole(event.locals, 'producer', 'host')
	};
}) satisfies PageServerLoad;

export const actions = {
	/** Saves the text against the version it was started from; a stale one answers 409 with the saved text. */
	save: async (event) => {
		const { channel, person, roles } = requireRole(event, 'producer', 'host');
		const form = await event.request.formData();
		const owned = await attempt('save', {}, () =>
			assertSegmentOfEpisode(channel.id, event.params.id, event.params.segmentId)
		);
		if (!owned.ok) return owned.failure;
		const values: { body: string; version: string; words?: number } = {
			body: text(form, 'body').replace(/\r\n?/g, '\n'),
			version: text(form, 'version')
		};
		const result = await runForm('save', scriptSaveSchema, values, (data) =>
			saveScript(channel.id, { ...person, roles }, event.params.segmentId, data)
		);
		if (!result.ok) {
			// Without JavaScript a refused save shows the typed text again, with its own word count
			// (the failure carries this same `values` object).
			values.words =
				values.body.length > SCRIPT_CHARACTER_LIMIT ? 0 : await spokenWords(values.body);
			return result.failure;
		}
		return { action: 'save', saved: result.value };
	}
} satisfies Actions;
