import { isRedirect, redirect } from '@sveltejs/kit';
import { signOut } from '../../auth';
import { closeSession } from '$lib/server/auth/sessions';
import { withFormBody } from '$lib/server/auth/form-body';
import { forgetBrowserChannel } from '$lib/server/channel/current-channel';
import type { Actions, PageServerLoad } from './$types';

export const load = (() => redirect(303, '/')) satisfies PageServerLoad;

export const actions = {
	default: async (event) => {
		if (event.locals.sessionId) await closeSession(event.locals.sessionId);
		forgetBrowserChannel(event);
		const request = withFormBody(event.request, new URLSearchParams({ redirectTo: '/signin' }));
		try {
			await signOut({ ...event, request });
		} catch (outcome) {
			// Auth.js answers with its own 302; the page answers 303 so a form POST becomes a GET.
			if (!isRedirect(outcome)) throw outcome;
		}
		redirect(303, '/signin');
	}
} satisfies Actions;
