import { error } from '@sveltejs/kit';
import { mailboxOpenTo, readMailbox } from '$lib/server/mail/mailbox';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	if (!mailboxOpenTo(event)) error(404, 'Not found.');
	return { messages: await readMailbox() };
}) satisfies PageServerLoad;
