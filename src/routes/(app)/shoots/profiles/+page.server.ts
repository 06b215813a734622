import { fail } from '@sveltejs/kit';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import { createProfile, deleteProfile, listProfiles } from '$lib/server/shoot/recording-profiles';
import { profileSchema } from '$lib/schemas/shoot';
import { attempt, parseForm } from '$lib/server/http/forms';
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
		const values = Object.fromEntries(await event.request.formData()) as Record<string, string>;
		const parsed = parseForm(profileSchema, values);
		if (!parsed.ok) return fail(400, { errors: parsed.errors, values });
		await createProfile(channel.id, parsed.data);
		return { created: true };
	},
	delete: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		const id = String((await event.request.formData()).get('id') ?? '');
		const result = await attempt({ id }, () => deleteProfile(channel.id, id));
		if (result && typeof result === 'object' && 'status' in result)
			return fail(result.status, result.data);
		return { deleted: true };
	}
} satisfies Actions;
