import { requireRole } from '$lib/server/auth/guard';
import { crewPageWithCounts, invitePerson, updateMember } from '$lib/server/channel/crew';
import { inviteSchema, crewUpdateSchema } from '$lib/schemas/people';
import { pageQuerySchema } from '$lib/schemas/paging';
import { fieldIssues } from '$lib/server/http/api';
import { forPage, runForm } from '$lib/server/http/forms';
import type { Actions, PageServerLoad } from './$types';

/** One page of the crew by name; "More crew" links to the page after the last person shown. */
export const load = (async (event) => {
	const { channel } = requireRole(event, 'producer');
	const parsed = pageQuerySchema.safeParse(
		Object.fromEntries([...event.url.searchParams].filter(([, value]) => value !== ''))
	);
	const query = parsed.success ? parsed.data : pageQuerySchema.parse({});
	const page = await forPage(() => crewPageWithCounts(channel.id, query));
	return {
		crew: page.items,
		next: page.next,
		counts: page.counts,
		after: Boolean(query.after),
		pageErrors: parsed.success ? null : fieldIssues(parsed.error)
	};
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
		const result = await runForm('invite', inviteSchema, values, (data) =>
			invitePerson(channel.id, person, data, event.url.origin)
		);
		if (!result.ok) return result.failure;
		return { action: 'invite' as const, invited: result.value.email };
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
		const result = await runForm({ action: 'update', personId }, crewUpdateSchema, values, (data) =>
			updateMember(channel.id, person.id, personId, data)
		);
		if (!result.ok) return result.failure;
		return { action: 'update' as const, personId, saved: true };
	}
} satisfies Actions;
