import { fail } from '@sveltejs/kit';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import { buildSheet, updateBuild } from '$lib/server/episodes/builds';
import { buildSchema } from '$lib/schemas/episodes';
import { parseForm } from '$lib/server/http/forms';
import { attemptAction, found } from '$lib/server/http/episode-forms';
import { buildFormValues } from '../build-form';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	return {
		sheet: await found(buildSheet(channel.id, event.params.id)),
		canEdit: hasRole(event.locals, 'producer', 'host')
	};
}) satisfies PageServerLoad;

export const actions = {
	save: async (event) => {
		const { channel } = requireRole(event, 'producer', 'host');
		const values = buildFormValues(await event.request.formData());
		const parsed = parseForm(buildSchema, values);
		if (!parsed.ok) return fail(400, { action: 'save', errors: parsed.errors, values });
		const result = await attemptAction('save', values, () =>
			updateBuild(channel.id, event.params.id, parsed.data)
		);
		if (!result.ok) return result.failure;
		return { action: 'save', saved: true };
	}
} satisfies Actions;
