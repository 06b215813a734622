import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import { deleteTake, logTake, shotListFor, updateTake } from '$lib/server/shoot/takes';
import { addShot } from '$lib/server/episodes/shots';
import { shotCreateSchema } from '$lib/schemas/episodes';
import { takeCreateSchema, takeUpdateSchema } from '$lib/schemas/takes';
import { attempt, forPage, parseForm } from '$lib/server/http/forms';
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

const text = (form: FormData, key: string) => String(form.get(key) ?? '');

export const actions = {
	addShot: async (event) => {
		const { channel } = requireRole(event, 'camera', 'producer');
		const form = await event.request.formData();
		const segmentId = text(form, 'segmentId');
		const values = shotFormValues(form);
		const parsed = parseForm(shotCreateSchema, values);
		if (!parsed.ok)
			return fail(400, { action: 'addShot', segmentId, errors: parsed.errors, values });
		const result = await attempt(values, async () => {
			await assertInEpisode(channel.id, event.params.id, 'segment', segmentId);
			return addShot(channel.id, segmentId, parsed.data);
		});
		if ('status' in result && 'data' in result)
			return fail(result.status, { action: 'addShot', segmentId, ...result.data });
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
		const parsed = parseForm(takeCreateSchema, values);
		if (!parsed.ok) return fail(400, { action: 'logTake', shotId, errors: parsed.errors, values });
		const result = await attempt(values, async () => {
			await assertInEpisode(channel.id, event.params.id, 'shot', shotId);
			return logTake(channel.id, shotId, parsed.data);
		});
		if ('status' in result && 'data' in result)
			return fail(result.status as number, {
				action: 'logTake',
				shotId,
				...(result.data as object)
			});
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
		const parsed = parseForm(takeUpdateSchema, values);
		if (!parsed.ok) return fail(400, { action: 'updateTake', takeId, errors: parsed.errors });
		const result = await attempt(values, async () => {
			await assertInEpisode(channel.id, event.params.id, 'take', takeId);
			return updateTake(channel.id, takeId, parsed.data);
		});
		if ('status' in result && 'data' in result)
			return fail(result.status as number, {
				action: 'updateTake',
				takeId,
				...(result.data as object)
			});
		return { action: 'updateTake', takeId, saved: true };
	},
	deleteTake: async (event) => {
		const { channel } = requireRole(event, 'camera', 'producer');
		const form = await event.request.formData();
		const parsed = parseForm(z.object({ takeId: z.string() }), { takeId: text(form, 'takeId') });
		if (!parsed.ok) return fail(400, { action: 'deleteTake', errors: parsed.errors });
		const result = await attempt({}, async () => {
			await assertInEpisode(channel.id, event.params.id, 'take', parsed.data.takeId);
			return deleteTake(channel.id, parsed.data.takeId);
		});
		if (result && typeof result === 'object' && 'status' in result)
			return fail(result.status, { action: 'deleteTake', ...result.data });
		return { action: 'deleteTake', saved: true };
	}
} satisfies Actions;
