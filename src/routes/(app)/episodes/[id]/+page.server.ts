import { redirect } from '@sveltejs/kit';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import { episodeFormOptions, updateEpisode } from '$lib/server/episodes/episodes';
import { requestEpisode } from '$lib/server/episodes/request-episode';
import { gateMaterialsFor } from '$lib/server/episodes/gate-snapshot';
import { moveStage, stageHistory, stageReportOf } from '$lib/server/episodes/stage-moves';
import { scriptStateOf } from '$lib/server/episodes/script-reviews';
import { episodeUpdateSchema, stageMoveSchema } from '$lib/schemas/episodes';
import { forPage, runForm, text } from '$lib/server/http/forms';
import { episodeFormValues } from '../episode-form';
import type { Actions, PageServerLoad } from './$types';
import { safeRedirectPath } from '$lib/safe-redirect';

export const load = (async (event) => {
	const { channel, person, roles } = requireRole(event);
	const id = event.params.id;
	// The episode (shared with the layout), everything its gate reads, and the history: a few
	// queries however big the episode (tests/integration/query-counts.test.ts).
	const [episode, materials, history, options] = await forPage(
		Promise.all([
			requestEpisode(event.locals, channel.id, id),
			gateMaterialsFor(channel.id, id),
			stageHistory(channel.id, id),
			hasRole(event.locals, 'producer') ? episodeFormOptions(channel.id) : Promise.resolve(null)
		])
	);
	const script = scriptStateOf(episode, materials.snapshot.script.currentFingerprint);
	// Everything returned here is written into the page again for hydration (devalue, per request):
	// only what the page shows or its form starts from, not the whole row.
	return {
		episode: {
			id: episode.id,
			title: episode.title,
			slug: episode.slug,
			logline: episode.logline,
			stage: episode.stage,
			targetRuntimeSeconds: episode.targetRuntimeSeconds,
			frameRate: episode.frameRate,
			timecodeDropFrame: episode.timecodeDropFrame,
			timecodeStart: episode.timecodeStart,
			publishDate: episode.publishDate,
			version: episode.version,
			assignments: episode.assignments.map(({ role, personId, name }) => ({
				role,
				personId,
				name
			})),
			builds: episode.builds.map(({ id, name }) => ({ id, name }))
		},
		stage: stageReportOf(materials, { id: person.id, roles }),
		history,
		script: {
			shown: script.shown,
			approvedAt: script.approvedAt,
			approvedByName: script.approvedByName
		},
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
