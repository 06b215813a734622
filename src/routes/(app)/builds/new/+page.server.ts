import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { createBuild } from '$lib/server/episodes/builds';
import { buildSchema } from '$lib/schemas/episodes';
import { runForm } from '$lib/server/http/forms';
import { buildFormValues } from '../build-form';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	requireRole(event, 'producer', 'host');
	return {};
}) satisfies PageServerLoad;

export const actions = {
	create: async (event) => {
		const { channel } = requireRole(event, 'producer', 'host');
		const values = buildFormValues(await event.request.formData());
		const result = await runForm('create', buildSchema, values, (data) =>
			createBuild(channel.id, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, `/builds/${result.value.build.id}`);
	}
} satisfies Actions;
