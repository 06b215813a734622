import { error, fail, redirect } from '@sveltejs/kit';
import { hasRole, requireRole } from '$lib/server/auth/guard';
import {
	addChapter,
	deleteChapter,
	findEditState,
	setCutDuration,
	updateChapter
} from '$lib/server/edit/edit';
import { attempt, parseForm, readVersion } from '$lib/server/http/forms';
import { chapterCreateSchema, chapterUpdateSchema, cutUpdateSchema } from '$lib/schemas/edit';
import type { TimelineMark } from '$lib/components/timeline';
import { cutVideoUrlFor, timelineMarksFor } from '$lib/server/edit/timeline-marks';
import type { Actions, PageServerLoad } from './$types';
import { safeRedirectPath } from '$lib/safe-redirect';

/**
 * The editor's timeline. Every crew member may look; the editor and the producer change the cut
 * and its chapters. With JavaScript the page talks to /api/episodes/[id]/…; these actions are the
 * same changes for a browser without it.
 */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	const state = await findEditState(channel.id, event.params.id);
	if (!state)
		error(
			404,
			'That episode was not found in this channel. If it belongs to another channel, switch channel first.'
		);
	const [cutVideoUrl, marks] = await Promise.all([
		cutVideoUrlFor(channel.id, event.params.id),
		timelineMarksFor(channel.id, event.params.id)
	]);
	return {
		state,
		canEdit: hasRole(event.locals, 'editor', 'producer'),
		/** The newest uploaded proxy or final cut, played under the timeline. */
		cutVideoUrl,
		/** Placed cautions, segment notes, featured parts and spec cards. */
		marks: marks as TimelineMark[]
	};
}) satisfies PageServerLoad;

const text = (form: FormData, name: string) => String(form.get(name) ?? '');
const number = (form: FormData, name: string) => Number(form.get(name) ?? Number.NaN);

export const actions = {
	setCut: async (event) => {
		const { channel } = requireRole(event, 'editor', 'producer');
		const form = await event.request.formData();
		const values = { duration: text(form, 'duration') };
		const parsed = parseForm(cutUpdateSchema, values);
		if (!parsed.ok) return fail(400, { action: 'setCut', errors: parsed.errors, values });
		const result = await attempt(values, () =>
			setCutDuration(channel.id, event.params.id, parsed.data)
		);
		if ('status' in result) return fail(result.status, { action: 'setCut', ...result.data });
		redirect(303, safeRedirectPath(event.url.pathname));
	},
	addChapter: async (event) => {
		const { channel } = requireRole(event, 'editor', 'producer');
		const form = await event.request.formData();
		const values = { start: text(form, 'start'), title: text(form, 'title') };
		const parsed = parseForm(chapterCreateSchema, values);
		if (!parsed.ok) return fail(400, { action: 'addChapter', errors: parsed.errors, values });
		const result = await attempt(values, () =>
			addChapter(channel.id, event.params.id, parsed.data)
		);
		if ('status' in result) return fail(result.status, { action: 'addChapter', ...result.data });
		redirect(303, safeRedirectPath(event.url.pathname));
	},
	saveChapter: async (event) => {
		const { channel } = requireRole(event, 'editor', 'producer');
		const form = await event.request.formData();
		const chapterId = text(form, 'chapterId');
		const values = {
			version: number(form, 'version'),
			start: text(form, 'start'),
			title: text(form, 'title')
		};
		const parsed = parseForm(chapterUpdateSchema, values);
		if (!parsed.ok)
			return fail(400, { action: 'saveChapter', chapterId, errors: parsed.errors, values });
		const result = await attempt(values, () =>
			updateChapter(channel.id, event.params.id, chapterId, parsed.data)
		);
		if ('status' in result)
			return fail(result.status, { action: 'saveChapter', chapterId, ...result.data });
		redirect(303, safeRedirectPath(event.url.pathname));
	},
	removeChapter: async (event) => {
		const { channel } = requireRole(event, 'editor', 'producer');
		const form = await event.request.formData();
		const chapterId = text(form, 'chapterId');
		const values = { version: number(form, 'version') };
		const read = readVersion(form);
		if (!read.ok)
			return fail(400, { action: 'removeChapter', chapterId, errors: read.errors, values });
		const result = await attempt(values, () =>
			deleteChapter(channel.id, event.params.id, chapterId, read.version)
		);
		if ('status' in result)
			return fail(result.status, { action: 'removeChapter', chapterId, ...result.data });
		redirect(303, safeRedirectPath(event.url.pathname));
	}
} satisfies Actions;
