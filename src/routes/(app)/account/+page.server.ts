import { requireRole } from '$lib/server/auth/guard';
import { createToken, listTokens, revokeToken } from '$lib/server/auth/tokens';
import { tokenCreateSchema } from '$lib/schemas/people';
import { attempt, runForm } from '$lib/server/http/forms';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { person, channel } = requireRole(event);
	return { tokens: await listTokens(channel.id, person.id) };
}) satisfies PageServerLoad;

export const actions = {
	createToken: async (event) => {
		const { person, channel } = requireRole(event);
		const form = await event.request.formData();
		const values = { label: String(form.get('label') ?? '') };
		const result = await runForm('createToken', tokenCreateSchema, values, (data) =>
			createToken(channel.id, person.id, data.label)
		);
		if (!result.ok) return result.failure;
		const created = result.value;
		return { action: 'createToken', created: { label: created.label, token: created.token } };
	},
	revokeToken: async (event) => {
		const { person, channel } = requireRole(event);
		const form = await event.request.formData();
		const id = String(form.get('id') ?? '');
		const result = await attempt('revokeToken', { id }, () =>
			revokeToken(channel.id, person.id, id)
		);
		if (!result.ok) return result.failure;
		return { action: 'revokeToken', revoked: true };
	}
} satisfies Actions;
