import { z } from 'zod';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import { deleteTake, logTake, shotListFor, updateTake } from '$lib/server/shoot/takes';
import { addShot } from '$lib/server/episodes/shots';
import { shotCreateSchema } from '$lib/schemas/episodes';
import { takeCreateSchema, takeUpdateSchema } from '$lib/schemas/takes';
import { forPage, runForm, text } from '$lib/server/http/forms';
import { assertInEpisode } from '$lib/server/http/ownership';
import { shotFormValues } from '../shot-form';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	return {
		list: await forPage(() => shotListFor(channel.id, event.params.id)),
		canLog: hasRole(event.locals, 'camera', 'producer')
	};
}) satisfies PageServerLoad;

export const actions = {
	addShot: async (event) => {
		const { channel } = requireRole(event, 'camera', 'producer');
		const form = await event.request.formData();
		const segmentId = text(form, 'segmentId');
		const values = shotFormValues(form);
		const tag = { action: 'addShot' as const, segmentId };
		const result = await runForm(tag, shotCreateSchema, values, async (data) => {
			await assertInEpisode(channel.id, event.params.id, 'segment', segmentId);
			return addShot(channel.id, segmentId, data);
		});
		if (!result.ok) return result.failure;
		return { action: 'addShot', segmentId, saved: true };
	},
	logTake: async (event) => {
		const { channel } = requireRole(event, 'camera', 'producer');
		const form = await event.request.formData();
		const shotId = text(form, 'shotId');
		const values = {
			clipName: text(form, 'clipName'),
			sourceIn: text(form, 'sourceIn'),
			sourceOut: text(form, 'sourceOut'),
			good: form.get('good') === 'on',
			note: text(form, 'note'),
			footageId: text(form, 'footageId')
		};
		const tag = { action: 'logTake' as const, shotId };
		const result = await runForm(tag, takeCreateSchema, values, async (data) => {
			await assertInEpisode(channel.id, event.params.id, 'shot', shotId);
			return logTake(channel.id, shotId, data);
		});
		if (!result.ok) return result.failure;
		return { action: 'logTake', shotId, saved: true };
	},
	updateTake: async (event) => {
		const { channel } = requireRole(event, 'camera', 'producer');
		const form = await event.request.formData();
		const takeId = text(form, 'takeId');
		const values = {
			version: text(form, 'version'),
			...(form.has('good') ? { good: form.get('good') === 'true' } : {}),
			...(form.has('footageId') ? { footageId: text(form, 'footageId') } : {})
		};
		const tag = { action: 'updateTake' as const, takeId };
		const result = await runForm(tag, takeUpdateSchema, values, async (data) => {
			await assertInEpisode(channel.id, event.params.id, 'take', takeId);
			return updateTake(channel.id, takeId, data);
		});
		if (!result.ok) return result.failure;
		return { action: 'updateTake', takeId, saved: true };
	},
	deleteTake: async (event) => {
		const { channel } = requireRole(event, 'camera', 'producer');
		const form = await event.request.formData();
		const values = { takeId: text(form, 'takeId') };
		const result = await runForm(
			'deleteTake',
			z.object({ takeId: z.string() }),
			values,
			async (data) => {
				await assertInEpisode(channel.id, event.params.id, 'take', data.takeId);
				return deleteTake(channel.id, data.takeId);
			}
		);
		if (!result.ok) return result.failure;
		return { action: 'deleteTake', saved: true };
	}
} satisfies Actions;
