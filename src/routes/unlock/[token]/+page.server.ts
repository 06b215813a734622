import { fail, redirect } from '@sveltejs/kit';
import { findUnlockLink, openUnlockLink, UNLOCK_COOKIE } from '$lib/server/auth/unlock';
import { UNLOCK_GRANT_MINUTES } from '$lib/server/auth/throttle-limits';
import type { Actions, PageServerLoad } from './$types';

/** Opening the page changes nothing (mail scanners follow links); its button opens the grant. */
export const load = (async ({ params }) => {
	const link = await findUnlockLink(params.token);
	return link ? { valid: true as const, email: link.email } : { valid: false as const };
}) satisfies PageServerLoad;

export const actions = {
	default: async ({ params, cookies, url }) => {
		if (!(await openUnlockLink(params.token)))
			return fail(404, {
				errors: { form: ['This unlock link has expired or was already used. Ask for a new one.'] }
			});
		cookies.set(UNLOCK_COOKIE, params.token, {
			path: '/',
			httpOnly: true,
			sameSite: 'lax',
			secure: url.protocol === 'https:',
			maxAge: UNLOCK_GRANT_MINUTES * 60
		});
		redirect(303, '/signin?unlocked=1');
	}
} satisfies Actions;
