import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { createBuild } from '$lib/server/episodes/builds';
import { buildSchema } from '$lib/schemas/episodes';
import { parseForm } from '$lib/server/http/forms';
import { attemptAction } from '$lib/server/http/episode-forms';
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
		const parsed = parseForm(buildSchema, values);
		if (!parsed.ok) return fail(400, { action: 'create', errors: parsed.errors, values });
		const result = await attemptAction('create', values, () =>
			createBuild(channel.id, parsed.data)
		);
		if (!result.ok) return result.failure;
		redirect(303, `/builds/${result.value.build.id}`);
	}
} satisfies Actions;
