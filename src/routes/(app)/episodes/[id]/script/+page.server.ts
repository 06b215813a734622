import { requireRole, hasRole } from '$lib/server/auth/guard';
import { rundownFor } from '$lib/server/episodes/rundown';
import { reviewScript, reviewsFor, scriptStateFor } from '$lib/server/episodes/script-reviews';
import { scriptHtml } from '$lib/server/episodes/script-reader';
import { scriptReviewSchema } from '$lib/schemas/episodes';
import { forPage, runForm, text } from '$lib/server/http/forms';
import { stageLock, type Stage } from '$lib/stages';
import type { Actions, PageServerLoad } from './$types';

/** The whole script to read, with its approval state and review trail; the producer approves here. */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	// The stage's lock takes the writing and approval controls away (the layout says why).
	const open = stageLock((await event.parent()).episodeHeader.stage as Stage, 'script') === null;
	const [rundown, state, reviews] = await forPage(
		Promise.all([
			rundownFor(channel.id, event.params.id),
			scriptStateFor(channel.id, event.params.id),
			reviewsFor(channel.id, event.params.id)
		])
	);
	const html = await Promise.all(
		rundown.segments.map((segment) => scriptHtml(segment.script.body))
	);
	return {
		rundown: {
			...rundown,
			segments: rundown.segments.map((segment, index) => ({ ...segment, html: html[index] }))
		},
		state,
		reviews,
		can: {
			write: open && hasRole(event.locals, 'producer', 'host'),
			approve: open && hasRole(event.locals, 'producer'),
			submit: open && hasRole(event.locals, 'producer', 'host')
		}
	};
}) satisfies PageServerLoad;

export const actions = {
	/** submit (host, producer) · approve / return (producer) · comment (host, producer). */
	review: async (event) => {
		const { channel, person, roles } = requireRole(event, 'producer', 'host');
		const form = await event.request.formData();
		const values = {
			action: text(form, 'action'),
			body: text(form, 'body'),
			fingerprint: text(form, 'fingerprint') || undefined,
			segmentId: text(form, 'segmentId') || null
		};
		const result = await runForm('review', scriptReviewSchema, values, async (data) => {
			await reviewScript(channel.id, { ...person, roles }, event.params.id, data, event.url.origin);
			return data.action;
		});
		if (!result.ok) return result.failure;
		return { action: 'review', done: result.value };
	}
} satisfies Actions;
