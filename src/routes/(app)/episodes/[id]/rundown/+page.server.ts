import { requireRole, hasRole } from '$lib/server/auth/guard';
import { createSegment } from '$lib/server/episodes/segments';
import { moveSegment } from '$lib/server/episodes/rundown-order';
import { rundownFor } from '$lib/server/episodes/rundown';
import { episodeFormOptions } from '$lib/server/episodes/episodes';
import { pickEpisodes } from '$lib/server/episodes/episode-picker';
import { EPISODE_PICKER_LIMIT, segmentCreateSchema } from '$lib/schemas/episodes';
import { attempt, forPage, runForm, text } from '$lib/server/http/forms';
import { segmentFormValues } from './segment-form';
import { stageLock, type Lockable, type Stage } from '$lib/stages';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	const { episodeHeader } = await event.parent();
	// The stage's locks take the editing controls away (the layout says why).
	const open = (what: Lockable) => stageLock(episodeHeader.stage as Stage, what) === null;
	const [rundown, options, episodes] = await forPage(
		Promise.all([
			rundownFor(channel.id, event.params.id),
			episodeFormOptions(channel.id),
			pickEpisodes(channel.id, { except: event.params.id, limit: EPISODE_PICKER_LIMIT })
		])
	);
	return {
		rundown,
		builds: options.builds,
		episodes,
		canPlan: open('rundown') && hasRole(event.locals, 'producer', 'host'),
		canPlanShots: open('shots') && hasRole(event.locals, 'producer', 'camera')
	};
}) satisfies PageServerLoad;

export const actions = {
	/** The host or a producer adds a segment at the end. */
	add: async (event) => {
		const { channel } = requireRole(event, 'producer', 'host');
		const values = segmentFormValues(await event.request.formData());
		const result = await runForm('add', segmentCreateSchema, values, (data) =>
			createSegment(channel.id, event.params.id, data)
		);
		if (!result.ok) return result.failure;
		return { action: 'add', added: result.value.id, title: result.value.title };
	},
	/** One step up or down: the rundown's reorder without JavaScript. */
	move: async (event) => {
		const { channel } = requireRole(event, 'producer', 'host');
		const form = await event.request.formData();
		const direction = text(form, 'direction') === 'up' ? 'up' : 'down';
		const values = { segmentId: text(form, 'segmentId'), direction };
		const result = await attempt('move', values, () =>
			moveSegment(channel.id, event.params.id, values.segmentId, direction)
		);
		if (!result.ok) return result.failure;
		return { action: 'move', moved: values.segmentId };
	}
} satisfies Actions;
