import { requireRole, hasRole } from '$lib/server/auth/guard';
import { createProfile, deleteProfile, listProfiles } from '$lib/server/shoot/recording-profiles';
import { profileSchema } from '$lib/schemas/shoot';
import { attempt, formFields, runForm } from '$lib/server/http/forms';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	return {
		profiles: await listProfiles(channel.id),
		canEdit: hasRole(event.locals, 'producer', 'camera')
	};
}) satisfies PageServerLoad;

export const actions = {
	create: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		const values = formFields(await event.request.formData());
		const result = await runForm('create', profileSchema, values, (data) =>
			createProfile(channel.id, data)
		);
		if (!result.ok) return result.failure;
		return { action: 'create', created: true };
	},
	delete: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		const id = String((await event.request.formData()).get('id') ?? '');
		const result = await attempt('delete', { id }, () => deleteProfile(channel.id, id));
		if (!result.ok) return result.failure;
		return { action: 'delete', deleted: true };
	}
} satisfies Actions;
