import { requireRole } from '$lib/server/auth/guard';
import { createToken, listTokens, revokeToken } from '$lib/server/auth/tokens';
import { passwordChangeSchema, renameSchema, tokenCreateSchema } from '$lib/schemas/people';
import { changePassword, renamePerson } from '$lib/server/auth/account';
import { attempt, invalid, parseForm, runForm, text } from '$lib/server/http/forms';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { person, channel } = requireRole(event);
	return { tokens: await listTokens(channel.id, person.id) };
}) satisfies PageServerLoad;

export const actions = {
	/** The name the crew sees, in every channel. */
	rename: async (event) => {
		const { person } = requireRole(event);
		const values = { name: text(await event.request.formData(), 'name') };
		const result = await runForm('rename', renameSchema, values, (data) =>
			renamePerson(person.id, data.name)
		);
		if (!result.ok) return result.failure;
		return { action: 'rename', saved: true };
	},
	/** A new password; the passwords typed never come back to the page. */
	password: async (event) => {
		const { person } = requireRole(event);
		const form = await event.request.formData();
		const typed = {
			currentPassword: text(form, 'currentPassword'),
			password: text(form, 'password'),
			confirm: text(form, 'confirm')
		};
		const parsed = parseForm(passwordChangeSchema, typed);
		if (!parsed.ok) return invalid('password', parsed.errors, {});
		const result = await attempt('password', {}, () =>
			changePassword(person.id, event.locals.sessionId, parsed.data)
		);
		if (!result.ok) return result.failure;
		return { action: 'password', changed: true };
	},
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
