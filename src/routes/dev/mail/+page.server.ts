import { error } from '@sveltejs/kit';
import { mailboxEnabled, readMailbox } from '$lib/server/mail/mailbox';
import type { PageServerLoad } from './$types';

export const load = (async () => {
	if (!mailboxEnabled()) error(404, 'Not found.');
	return { messages: await readMailbox() };
}) satisfies PageServerLoad;
