import { error, json } from '@sveltejs/kit';
import { mailboxEnabled, readMailbox } from '$lib/server/mail/mailbox';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async () => {
	if (!mailboxEnabled()) error(404, 'Not found.');
	return json({ messages: await readMailbox() });
};
