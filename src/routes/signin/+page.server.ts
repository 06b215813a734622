import { fail, isRedirect, redirect } from '@sveltejs/kit';
import { CredentialsSignin } from '@auth/sveltekit';
import { signIn } from '../../auth';
import { signInSchema } from '$lib/schemas/people';
import { fieldIssues } from '$lib/server/http/api';
import { withFormBody } from '$lib/server/auth/form-body';
import { safeRedirectPath } from '$lib/safe-redirect';
import { waitInWords } from '$lib/wait-in-words';
import type { Actions, PageServerLoad } from './$types';

const MISMATCH = "That e-mail and password don't match an active crew account.";

/** What a throttled sign-in tells the person, by Auth.js's code: the address, or their network. */
function throttledMessage(code: string | null, seconds: number | undefined) {
	const wait = seconds ? `Try again in ${waitInWords(seconds)}` : 'Try again later';
	return code === 'throttled-client'
		? `Too many failed sign-ins from your network. ${wait}, or mail yourself an unlock link below.`
		: `Too many tries for this address. ${wait}, or mail yourself an unlock link below.`;
}

export const load = (async ({ locals, url }) => {
	if (locals.person) redirect(303, safeRedirectPath(url.searchParams.get('next')));
	const code = url.searchParams.get('code');
	const error = url.searchParams.get('error');
	const throttled = code === 'throttled' || code === 'throttled-client';
	return {
		notice: throttled ? throttledMessage(code, undefined) : error ? MISMATCH : null,
		unlock: throttled,
		success: url.searchParams.has('welcome')
			? 'Password set. Sign in with it now.'
			: url.searchParams.has('reset')
				? 'New password saved. Sign in with it now.'
				: url.searchParams.has('unlocked')
					? 'Signing in is unlocked on this browser for the next hour. Sign in with your password.'
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
			return fail(400, {
				errors: fieldIssues(parsed.error),
				values: { email: values.email },
				unlock: false
			});

		// Hand the checked fields to Auth.js as the form post it expects.
		const body = new FormData();
		body.set('providerId', 'credentials');
		body.set('email', parsed.data.email);
		body.set('password', parsed.data.password);
		body.set('redirectTo', safeRedirectPath(form.get('next')));
		const request = withFormBody(event.request, body);
		const refuse = (code: string | null) => {
			const throttled = code === 'throttled' || code === 'throttled-client';
			return fail(throttled ? 429 : 400, {
				errors: <Record<string, string[]>>{
					form: [throttled ? throttledMessage(code, event.locals.retryAfter) : MISMATCH]
				},
				values: { email: values.email },
				unlock: throttled
			});
		};
		try {
			await signIn({ ...event, request });
		} catch (outcome) {
			if (isRedirect(outcome)) {
				const target = new URL(outcome.location, event.url);
				if (target.searchParams.has('error')) return refuse(target.searchParams.get('code'));
				redirect(
					303,
					target.origin === event.url.origin
						? safeRedirectPath(target.pathname + target.search)
						: '/'
				);
			}
			// Auth.js throws its CredentialsSignin error (or our throttling subclass) for a refused sign-in.
			if (outcome instanceof CredentialsSignin) return refuse(outcome.code);
			throw outcome;
		}
		redirect(303, '/');
	}
} satisfies Actions;
