import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import * as days from '$lib/server/shoot/shoot-days';
import * as items from '$lib/server/shoot/day-items';
import {
	cameraSchema,
	gearSchema,
	idListSchema,
	onHandSchema,
	plannerSchema,
	pullItemSchema,
	shootDayUpdateSchema
} from '$lib/schemas/shoot';
import { attempt, formFields, forPage, invalid, parseForm } from '$lib/server/http/forms';
import { assertOnShootDay } from '$lib/server/http/ownership';
import { searchPartsForPicker } from '$lib/server/merch/parts-picker';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	const detail = await forPage(() => days.shootDayDetail(channel.id, event.params.id));
	return {
		...detail,
		parts: await searchPartsForPicker(channel.id),
		canPlan: hasRole(event.locals, 'producer', 'camera'),
		canPull: hasRole(event.locals, 'producer', 'camera', 'merch'),
		canCheck: hasRole(event.locals, 'merch', 'producer'),
		canDelete: hasRole(event.locals, 'producer')
	};
}) satisfies PageServerLoad;

/** Reads the form, validates it and runs the domain call; every failure keeps what was typed. */
async function run<const Action extends string, T extends z.ZodType>(
	event: RequestEvent,
	action: Action,
	schema: T,
	work: (data: z.infer<T>) => Promise<unknown>,
	read?: (form: FormData) => unknown
) {
	const form = await event.request.formData();
	const values = formFields(form);
	const parsed = parseForm(schema, read ? read(form) : values);
	if (!parsed.ok) return invalid(action, parsed.errors, values);
	const result = await attempt(action, values, () => work(parsed.data));
	if (!result.ok) return result.failure;
	return { action, saved: true as const };
}

export const actions = {
	save: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		return run(event, 'save', shootDayUpdateSchema, (data) =>
			days.updateShootDay(channel.id, event.params.id, data)
		);
	},
	planner: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		return run(event, 'planner', plannerSchema, (data) =>
			days.updatePlanner(channel.id, event.params.id, data)
		);
	},
	members: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		return run(
			event,
			'members',
			z.object({ list: z.enum(['crew', 'builds', 'segments']), ids: idListSchema }),
			(data) => items.setDayMembers(channel.id, event.params.id, data.list, data.ids),
			(form) => ({ list: form.get('list'), ids: form.getAll('ids').map(String) })
		);
	},
	addCamera: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		return run(event, 'addCamera', cameraSchema, (data) =>
			items.addCamera(channel.id, event.params.id, data)
		);
	},
	addGear: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		return run(event, 'addGear', gearSchema, (data) =>
			items.addGear(channel.id, event.params.id, data)
		);
	},
	addPull: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera', 'merch');
		return run(event, 'addPull', pullItemSchema, (data) =>
			items.addPullItem(channel.id, event.params.id, data)
		);
	},
	onHand: async (event) => {
		const { channel, person } = requireRole(event, 'merch', 'producer');
		return run(
			event,
			'onHand',
			onHandSchema.extend({ id: z.string() }),
			async (data) => {
				await assertOnShootDay(channel.id, event.params.id, 'pull', data.id);
				return items.setPullOnHand(channel.id, data.id, person.id, data.onHand, data.version);
			},
			(form) => ({
				id: form.get('id'),
				onHand: form.get('onHand') === 'true',
				version: form.get('version')
			})
		);
	},
	pullFromSegments: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera', 'merch');
		const result = await attempt('pullFromSegments', {}, () =>
			items.pullPartsFromSegments(channel.id, event.params.id)
		);
		if (!result.ok) return result.failure;
		return { action: 'pullFromSegments' as const, added: result.value.added };
	},
	removeItem: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		return run(
			event,
			'removeItem',
			z.object({ kind: z.enum(['camera', 'gear']), id: z.string() }),
			async (data) => {
				await assertOnShootDay(channel.id, event.params.id, data.kind, data.id);
				return items.removeDayItem(channel.id, data.kind, data.id);
			}
		);
	},
	removePull: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera', 'merch');
		return run(event, 'removePull', z.object({ id: z.string() }), async (data) => {
			await assertOnShootDay(channel.id, event.params.id, 'pull', data.id);
			return items.removeDayItem(channel.id, 'pull', data.id);
		});
	},
	delete: async (event) => {
		const { channel } = requireRole(event, 'producer');
		const result = await attempt('delete', {}, () =>
			days.deleteShootDay(channel.id, event.params.id)
		);
		if (!result.ok) return result.failure;
		redirect(303, '/shoots');
	}
} satisfies Actions;
