import { fail, isRedirect, redirect } from '@sveltejs/kit';
import { CredentialsSignin } from '@auth/sveltekit';
import { signIn } from '../../auth';
import { signInSchema } from '$lib/schemas/people';
import { fieldIssues } from '$lib/server/http/api';
import { withFormBody } from '$lib/server/auth/form-body';
import type { Actions, PageServerLoad } from './$types';

/**
 * Where to go after signing in: only a path on this site. The address is resolved the way a browser
 * would (WHATWG URL: "\\" counts as "/", so "/\\evil.example" is another host) and kept only when it
 * stays on our origin; then only its path and query are used.
 */
const safeNext = (next: string | null) => {
	if (!next || !next.startsWith('/')) return '/';
	const base = 'http://wrenchroll.invalid';
	let target: URL;
	try {
		target = new URL(next, base);
	} catch {
		return '/';
	}
	return target.origin === base ? target.pathname + target.search : '/';
};

export const load = (async ({ locals, url }) => {
	if (locals.person) redirect(303, safeNext(url.searchParams.get('next')));
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
		next: safeNext(url.searchParams.get('next'))
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
		body.set('redirectTo', safeNext(String(form.get('next') ?? '/')));
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
					target.origin === event.url.origin ? safeNext(target.pathname + target.search) : '/'
				);
			}
			// Auth.js throws its CredentialsSignin error (or our throttling subclass) for a refused sign-in.
			if (outcome instanceof CredentialsSignin) return refuse(outcome.code === 'throttled');
			throw outcome;
		}
		redirect(303, '/');
	}
} satisfies Actions;
