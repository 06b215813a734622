import { error, json } from '@sveltejs/kit';
import { mailboxOpenTo, readMailbox } from '$lib/server/mail/mailbox';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	if (!mailboxOpenTo(event)) error(404, 'Not found.');
	return json({ messages: await readMailbox() });
};
