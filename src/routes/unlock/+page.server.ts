import { requestUnlockLink } from '$lib/server/auth/unlock';
import { mailLinkAction } from '$lib/server/auth/mail-link-action';
import type { Actions } from './$types';

export const actions = {
	default: mailLinkAction(requestUnlockLink, 'Too many links asked for.')
} satisfies Actions;
