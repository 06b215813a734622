import { fail, redirect } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import { createShootDay, listShootDays } from '$lib/server/shoot/shoot-days';
import { shootDaySchema } from '$lib/schemas/shoot';
import { attempt, parseForm } from '$lib/server/http/forms';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	const [days, episodes] = await Promise.all([
		listShootDays(channel.id),
		db
			.selectFrom('episode')
			.select(['id', 'title', 'stage'])
			.where('channelId', '=', channel.id)
			.where('stage', 'in', ['script', 'shoot'])
			.orderBy('title')
			.execute()
	]);
	return { days, episodes, canPlan: hasRole(event.locals, 'producer', 'camera') };
}) satisfies PageServerLoad;

export const actions = {
	create: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		const form = Object.fromEntries(await event.request.formData()) as Record<string, string>;
		const parsed = parseForm(shootDaySchema, form);
		if (!parsed.ok) return fail(400, { errors: parsed.errors, values: form });
		const result = await attempt(form, () => createShootDay(channel.id, parsed.data));
		if ('status' in result) return fail(result.status, result.data);
		redirect(303, `/shoots/${result.id}`);
	}
} satisfies Actions;
