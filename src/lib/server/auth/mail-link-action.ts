/**
 * The one action behind the reset and unlock pages: an e-mail address in, a link mailed to it, and
 * a 429 in words (with Retry-After) when links for it were asked for too often. The answer is the
 * same whether or not the address has an account.
 */
import type { RequestEvent } from '@sveltejs/kit';
import { forgotSchema } from '$lib/schemas/people';
import { DomainError } from '../http/api';
import { runForm, text } from '../http/forms';
import { connectingAddress } from './client-address';
import type { MailLinkRequest } from './unlock';
import { waitInWords } from '$lib/wait-in-words';

/** `tooMany` starts the refusal: "Too many reset links asked for." */
export function mailLinkAction(send: MailLinkRequest, tooMany: string) {
	return async (event: RequestEvent) => {
		const values = { email: text(await event.request.formData(), 'email') };
		const result = await runForm('send', forgotSchema, values, async (data) => {
			const outcome = await send(data.email, event.url.origin, connectingAddress(event));
			if (outcome.sent) return;
			event.locals.retryAfter = outcome.retryAfter;
			throw new DomainError(
				429,
				`${tooMany} Look for the one already sent, or try again in ${waitInWords(outcome.retryAfter)}.`
			);
		});
		if (!result.ok) return result.failure;
		return { action: 'send' as const, sent: true as const, values };
	};
}
