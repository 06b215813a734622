import { fail } from '@sveltejs/kit';
import { forgotSchema } from '$lib/schemas/people';
import { fieldIssues } from '$lib/server/http/api';
import { requestUnlockLink } from '$lib/server/auth/unlock';
import { waitInWords } from '$lib/wait-in-words';
import { connectingAddress } from '$lib/server/auth/client-address';
import type { Actions } from './$types';

export const actions = {
	default: async (event) => {
		const form = await event.request.formData();
		const values = { email: String(form.get('email') ?? '') };
		const parsed = forgotSchema.safeParse(values);
		if (!parsed.success) return fail(400, { errors: fieldIssues(parsed.error), values });
		const outcome = await requestUnlockLink(
			parsed.data.email,
			event.url.origin,
			connectingAddress(event)
		);
		if (!outcome.sent) {
			event.locals.retryAfter = outcome.retryAfter;
			return fail(429, {
				errors: <Record<string, string[]>>{
					form: [
						`Too many links asked for. Look for the one already sent, or try again in ${waitInWords(outcome.retryAfter)}.`
					]
				},
				values
			});
		}
		return { sent: true, values };
	}
} satisfies Actions;
