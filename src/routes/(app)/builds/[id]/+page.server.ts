import { requireRole, hasRole } from '$lib/server/auth/guard';
import { buildSheet, updateBuild } from '$lib/server/episodes/builds';
import { buildSchema } from '$lib/schemas/episodes';
import { forPage, runForm } from '$lib/server/http/forms';
import { buildFormValues } from '../build-form';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	return {
		sheet: await forPage(buildSheet(channel.id, event.params.id)),
		canEdit: hasRole(event.locals, 'producer', 'host')
	};
}) satisfies PageServerLoad;

export const actions = {
	save: async (event) => {
		const { channel } = requireRole(event, 'producer', 'host');
		const values = buildFormValues(await event.request.formData());
		const result = await runForm('save', buildSchema, values, (data) =>
			updateBuild(channel.id, event.params.id, data)
		);
		if (!result.ok) return result.failure;
		return { action: 'save', saved: true };
	}
} satisfies Actions;
