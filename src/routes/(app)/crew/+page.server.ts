import { fail } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { invitePerson, listCrew, updateMember } from '$lib/server/channel/crew';
import { inviteSchema, crewUpdateSchema } from '$lib/schemas/people';
import { attempt, parseForm } from '$lib/server/http/forms';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event, 'producer');
	return { crew: await listCrew(channel.id) };
}) satisfies PageServerLoad;

export const actions = {
	invite: async (event) => {
		const { channel, person } = requireRole(event, 'producer');
		const form = await event.request.formData();
		const values = {
			email: String(form.get('email') ?? ''),
			name: String(form.get('name') ?? ''),
			roles: form.getAll('roles').map(String)
		};
		const parsed = parseForm(inviteSchema, values);
		if (!parsed.ok) return fail(400, { action: 'invite' as const, errors: parsed.errors, values });
		const result = await attempt(values, () =>
			invitePerson(channel.id, person, parsed.data, event.url.origin)
		);
		if ('status' in result)
			return fail(result.status, { action: 'invite' as const, ...result.data });
		return { action: 'invite' as const, invited: result.email };
	},
	update: async (event) => {
		const { channel, person } = requireRole(event, 'producer');
		const form = await event.request.formData();
		const personId = String(form.get('personId') ?? '');
		const disabled = form.get('disabled');
		const values = {
			roles: form.has('roles-present') ? form.getAll('roles').map(String) : undefined,
			disabled: disabled === null ? undefined : disabled === 'true'
		};
		const parsed = parseForm(crewUpdateSchema, values);
		if (!parsed.ok)
			return fail(400, { action: 'update' as const, personId, errors: parsed.errors, values });
		const result = await attempt(values, () =>
			updateMember(channel.id, person.id, personId, parsed.data)
		);
		if ('status' in result)
			return fail(result.status, { action: 'update' as const, personId, ...result.data });
		return { action: 'update' as const, personId, saved: true };
	}
} satisfies Actions;
