import { requestPasswordReset } from '$lib/server/channel/crew';
import { mailLinkAction } from '$lib/server/auth/mail-link-action';
import type { Actions } from './$types';

export const actions = {
	default: mailLinkAction(requestPasswordReset, 'Too many reset links asked for.')
} satisfies Actions;
