import { redirect } from '@sveltejs/kit';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import { episodeDetail, episodeFormOptions, updateEpisode } from '$lib/server/episodes/episodes';
import { moveStage, stageHistory, stageReportFor } from '$lib/server/episodes/stage-moves';
import { scriptStateFor } from '$lib/server/episodes/script-reviews';
import { episodeUpdateSchema, stageMoveSchema } from '$lib/schemas/episodes';
import { forPage, runForm, text } from '$lib/server/http/forms';
import { episodeFormValues } from '../episode-form';
import type { Actions, PageServerLoad } from './$types';
import { safeRedirectPath } from '$lib/safe-redirect';

export const load = (async (event) => {
	const { channel, person, roles } = requireRole(event);
	const id = event.params.id;
	const [episode, stage, history, script, options] = await forPage(
		Promise.all([
			episodeDetail(channel.id, id),
			stageReportFor(channel.id, id, { id: person.id, roles }),
			stageHistory(channel.id, id),
			scriptStateFor(channel.id, id),
			hasRole(event.locals, 'producer') ? episodeFormOptions(channel.id) : Promise.resolve(null)
		])
	);
	return {
		episode,
		stage,
		history,
		script,
		options,
		canEditDetails: hasRole(event.locals, 'producer')
	};
}) satisfies PageServerLoad;

export const actions = {
	/** A producer saves the episode's details (version-checked). */
	save: async (event) => {
		const { channel, person, roles } = requireRole(event, 'producer');
		const form = await event.request.formData();
		const values = { ...episodeFormValues(form), version: text(form, 'version') };
		const result = await runForm('save', episodeUpdateSchema, values, (data) =>
			updateEpisode(channel.id, { ...person, roles }, event.params.id, data, event.url.origin)
		);
		if (!result.ok) return result.failure;
		return { action: 'save', saved: true };
	},
	/** Moves the episode; the domain decides who may and runs the gate (422 with the reasons). */
	move: async (event) => {
		const { channel, person, roles } = requireRole(event);
		const form = await event.request.formData();
		const values = { to: text(form, 'to'), from: text(form, 'from'), note: text(form, 'note') };
		const result = await runForm('move', stageMoveSchema, values, (data) =>
			moveStage(channel.id, { ...person, roles }, event.params.id, data, event.url.origin)
		);
		if (!result.ok) return result.failure;
		redirect(
			303,
			safeRedirectPath(`/episodes/${event.params.id}?moved=${result.value.episode.stage}`)
		);
	}
} satisfies Actions;
