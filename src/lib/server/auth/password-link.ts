/** The shared load and action of the invite and reset pages: both set a password through a one-time link. */
import { fail, redirect, type RequestEvent } from '@sveltejs/kit';
import { setPasswordSchema } from '$lib/schemas/people';
import { DomainError, fieldIssues } from '../http/api';
import { findLink, setPasswordWithLink } from '../channel/crew';

export async function loadLink(token: string, purpose: 'invite' | 'reset') {
	const link = await findLink(token, purpose);
	return link
		? {
				valid: true as const,
				email: link.email,
				name: link.name,
				channelName: link.channelName,
				hasPassword: Boolean(link.passwordHash)
			}
		: { valid: false as const };
}

export async function setPasswordAction(
	event: RequestEvent<{ token: string }>,
	purpose: 'invite' | 'reset'
) {
	const form = await event.request.formData();
	const parsed = setPasswordSchema.safeParse({
		password: String(form.get('password') ?? ''),
		confirm: String(form.get('confirm') ?? '')
	});
	if (!parsed.success) return fail(400, { errors: fieldIssues(parsed.error) });
	try {
		await setPasswordWithLink(event.params.token, purpose, parsed.data.password);
	} catch (failure) {
		if (failure instanceof DomainError)
			return fail(failure.status, { errors: failure.issues ?? { form: [failure.message] } });
		throw failure;
	}
	redirect(303, `/signin?${purpose === 'invite' ? 'welcome' : 'reset'}=1`);
}
