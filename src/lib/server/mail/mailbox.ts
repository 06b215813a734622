/**
 * The dev-only mailbox: reads what the loopback fake mail server stored. It exists only when
 * DEV_MAILBOX_DIR is set, which the start command and the tests do when they run the fake.
 */
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { env } from '$env/dynamic/private';

export interface StoredMail {
	id: string;
	receivedAt: string;
	from: string;
	to: string[];
	subject: string;
	text: string;
}

export const mailboxEnabled = () => Boolean(env.DEV_MAILBOX_DIR);

export async function readMailbox(limit = 200): Promise<StoredMail[]> {
	const dir = env.DEV_MAILBOX_DIR;
	if (!dir) return [];
	const names = (await readdir(dir).catch(() => [] as string[])).filter((n) => n.endsWith('.json')).sort().reverse().slice(0, limit);
	const messages = await Promise.all(
		names.map(async (name) => {
			try {
				return JSON.parse(await readFile(path.join(dir, name), 'utf8')) as StoredMail;
			} catch {
				return null; // removed or unreadable meanwhile: skip it
			}
		})
	);
	return messages.filter((message): message is StoredMail => message !== null);
}
