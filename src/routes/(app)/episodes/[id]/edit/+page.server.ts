import { redirect } from '@sveltejs/kit';
import { hasRole, requireRole } from '$lib/server/auth/guard';
import {
	addChapter,
	deleteChapter,
	editStateFor,
	setCutDuration,
	updateChapter
} from '$lib/server/edit/edit';
import { attempt, forPage, runForm, text } from '$lib/server/http/forms';
import { versionOnlySchema } from '$lib/schemas/fields';
import {
	chapterCreateSchema,
	chapterUpdateSchema,
	cutUpdateSchema,
	segmentSpanSchema
} from '$lib/schemas/edit';
import { segmentSpansFor, setSegmentSpan } from '$lib/server/edit/segment-spans';
import { assertSegmentOfEpisode } from '$lib/server/episodes/segment-in-channel';
import type { TimelineMark } from '$lib/components/timeline';
import { currentCutFor, timelineMarksFor } from '$lib/server/edit/timeline-marks';
import type { Actions, PageServerLoad } from './$types';
import { safeRedirectPath } from '$lib/safe-redirect';

/**
 * The editor's timeline. Every crew member may look; the editor and the producer change the cut
 * and its chapters. With JavaScript the page talks to /api/episodes/[id]/…; these actions are the
 * same changes for a browser without it.
 */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	const state = await forPage(editStateFor(channel.id, event.params.id));
	const [currentCut, marks, segments] = await Promise.all([
		currentCutFor(channel.id, event.params.id),
		timelineMarksFor(channel.id, event.params.id),
		forPage(segmentSpansFor(channel.id, event.params.id))
	]);
	return {
		state,
		canEdit: hasRole(event.locals, 'editor', 'producer'),
		/** The current version of the cut (the newest), played under the timeline. */
		cutVideoUrl: currentCut?.url ?? null,
		currentCut: currentCut && { label: currentCut.label, lengthFrames: currentCut.lengthFrames },
		/** Placed cautions, segment notes, featured parts, spec cards and open review comments. */
		marks: [...marks, ...(currentCut?.commentMarks ?? [])] as TimelineMark[],
		/** The rundown's segments with their in and out points on the timeline. */
		segments,
		/** The current version's sound lane under the timeline (CutWaveform.svelte); null without a video cut. */
		cutWaveform: currentCut?.waveform ?? null
	};
}) satisfies PageServerLoad;

export const actions = {
	setCut: async (event) => {
		const { channel } = requireRole(event, 'editor', 'producer');
		const form = await event.request.formData();
		const values = { duration: text(form, 'duration') };
		const result = await runForm('setCut', cutUpdateSchema, values, (data) =>
			setCutDuration(channel.id, event.params.id, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, safeRedirectPath(event.url.pathname));
	},
	setSpan: async (event) => {
		const { channel } = requireRole(event, 'editor', 'producer');
		const form = await event.request.formData();
		const segmentId = text(form, 'segmentId');
		const values = {
			version: text(form, 'version'),
			in: text(form, 'in'),
			out: text(form, 'out')
		};
		const tag = { action: 'setSpan' as const, segmentId };
		const owned = await attempt(tag, values, () =>
			assertSegmentOfEpisode(channel.id, event.params.id, segmentId)
		);
		if (!owned.ok) return owned.failure;
		const result = await runForm(tag, segmentSpanSchema, values, (data) =>
			setSegmentSpan(channel.id, segmentId, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, safeRedirectPath(event.url.pathname));
	},
	addChapter: async (event) => {
		const { channel } = requireRole(event, 'editor', 'producer');
		const form = await event.request.formData();
		const values = { start: text(form, 'start'), title: text(form, 'title') };
		const result = await runForm('addChapter', chapterCreateSchema, values, (data) =>
			addChapter(channel.id, event.params.id, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, safeRedirectPath(event.url.pathname));
	},
	saveChapter: async (event) => {
		const { channel } = requireRole(event, 'editor', 'producer');
		const form = await event.request.formData();
		const chapterId = text(form, 'chapterId');
		const values = {
			version: text(form, 'version'),
			start: text(form, 'start'),
			title: text(form, 'title')
		};
		const tag = { action: 'saveChapter' as const, chapterId };
		const result = await runForm(tag, chapterUpdateSchema, values, (data) =>
			updateChapter(channel.id, event.params.id, chapterId, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, safeRedirectPath(event.url.pathname));
	},
	removeChapter: async (event) => {
		const { channel } = requireRole(event, 'editor', 'producer');
		const form = await event.request.formData();
		const chapterId = text(form, 'chapterId');
		const values = { version: text(form, 'version') };
		const tag = { action: 'removeChapter' as const, chapterId };
		const result = await runForm(tag, versionOnlySchema, values, ({ version }) =>
			deleteChapter(channel.id, event.params.id, chapterId, version)
		);
		if (!result.ok) return result.failure;
		redirect(303, safeRedirectPath(event.url.pathname));
	}
} satisfies Actions;
