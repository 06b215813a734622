import { fail, isRedirect, redirect } from '@sveltejs/kit';
import { CredentialsSignin } from '@auth/sveltekit';
import { signIn } from '../../auth';
import { signInSchema } from '$lib/schemas/people';
import { fieldIssues } from '$lib/server/http/api';
import { withFormBody } from '$lib/server/auth/form-body';
import { safeRedirectPath } from '$lib/safe-redirect';
import type { Actions, PageServerLoad } from './$types';

export const load = (async ({ locals, url }) => {
	if (locals.person) redirect(303, safeRedirectPath(url.searchParams.get('next')));
	const code = url.searchParams.get('code');
	const error = url.searchParams.get('error');
	return {
		notice:
			code === 'throttled'
				? 'Too many tries for this address. Wait 15 minutes, or reset the password by e-mail.'
				: error
					? "That e-mail and password don't match an active crew account."
					: null,
		success: url.searchParams.has('welcome')
			? 'Password set. Sign in with it now.'
			: url.searchParams.has('reset')
				? 'New password saved. Sign in with it now.'
				: null,
		next: safeRedirectPath(url.searchParams.get('next'))
	};
}) satisfies PageServerLoad;

export const actions = {
	default: async (event) => {
		const form = await event.request.formData();
		const values = {
			email: String(form.get('email') ?? ''),
			password: String(form.get('password') ?? '')
		};
		const parsed = signInSchema.safeParse(values);
		if (!parsed.success)
			return fail(400, { errors: fieldIssues(parsed.error), values: { email: values.email } });

		// Hand the checked fields to Auth.js as the form post it expects.
		const body = new FormData();
		body.set('providerId', 'credentials');
		body.set('email', parsed.data.email);
		body.set('password', parsed.data.password);
		body.set('redirectTo', safeRedirectPath(form.get('next')));
		const request = withFormBody(event.request, body);
		const refuse = (throttled: boolean) =>
			fail(throttled ? 429 : 400, {
				errors: <Record<string, string[]>>{
					form: [
						throttled
							? 'Too many tries for this address. Wait 15 minutes, or reset the password by e-mail.'
							: "That e-mail and password don't match an active crew account."
					]
				},
				values: { email: values.email }
			});
		try {
			await signIn({ ...event, request });
		} catch (outcome) {
			if (isRedirect(outcome)) {
				const target = new URL(outcome.location, event.url);
				if (target.searchParams.has('error'))
					return refuse(target.searchParams.get('code') === 'throttled');
				redirect(
					303,
					target.origin === event.url.origin
						? safeRedirectPath(target.pathname + target.search)
						: '/'
				);
			}
			// Auth.js throws its CredentialsSignin error (or our throttling subclass) for a refused sign-in.
			if (outcome instanceof CredentialsSignin) return refuse(outcome.code === 'throttled');
			throw outcome;
		}
		redirect(303, '/');
	}
} satisfies Actions;
