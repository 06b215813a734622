import { fail } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { createToken, listTokens, revokeToken } from '$lib/server/auth/tokens';
import { tokenCreateSchema } from '$lib/schemas/people';
import { attempt, parseForm } from '$lib/server/http/forms';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { person, channel } = requireRole(event);
	return { tokens: await listTokens(person.id, channel.id) };
}) satisfies PageServerLoad;

export const actions = {
	createToken: async (event) => {
		const { person, channel } = requireRole(event);
		const form = await event.request.formData();
		const values = { label: String(form.get('label') ?? '') };
		const parsed = parseForm(tokenCreateSchema, values);
		if (!parsed.ok) return fail(400, { errors: parsed.errors, values });
		const created = await createToken(person.id, channel.id, parsed.data.label);
		return { created: { label: created.label, token: created.token } };
	},
	revokeToken: async (event) => {
		const { person, channel } = requireRole(event);
		const form = await event.request.formData();
		const id = String(form.get('id') ?? '');
		const result = await attempt({ id }, () => revokeToken(person.id, channel.id, id));
		if (result && typeof result === 'object' && 'status' in result)
			return fail(result.status, result.data);
		return { revoked: true };
	}
} satisfies Actions;
