import { redirect } from '@sveltejs/kit';
import { db } from '$lib/server/db';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import { createShootDay, listShootDays } from '$lib/server/shoot/shoot-days';
import { shootDaySchema } from '$lib/schemas/shoot';
import { formFields, runForm } from '$lib/server/http/forms';
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
		const values = formFields(await event.request.formData());
		const result = await runForm('create', shootDaySchema, values, (data) =>
			createShootDay(channel.id, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, `/shoots/${result.value.id}`);
	}
} satisfies Actions;
