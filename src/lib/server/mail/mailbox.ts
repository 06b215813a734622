/**
 * The dev-only mailbox: reads what the loopback fake mail server stored. It exists only when
 * DEV_MAILBOX_DIR is set, which the start command and the tests do when they run the fake, and it
 * answers only callers on this machine: the mail holds invite and password-reset links.
 */
import { BlockList, isIPv4 } from 'node:net';
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

// Loopback addresses: 127.0.0.0/8 (RFC 1122 §3.2.1.3) and ::1 (RFC 4291 §2.5.3), also written as an
// IPv4-mapped IPv6 address (::ffff:127.x.y.z, RFC 4291 §2.5.5.2).
const loopback = new BlockList();
loopback.addSubnet('127.0.0.0', 8, 'ipv4');
loopback.addAddress('::1', 'ipv6');

export function isLoopbackAddress(address: string): boolean {
	const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(address)?.[1];
	const plain = mapped ?? address;
	try {
		return loopback.check(plain, isIPv4(plain) ? 'ipv4' : 'ipv6');
	} catch {
		return false; // not an IP address at all
	}
}

/** The mailbox is on, and the caller is on this machine. */
export function mailboxOpenTo(event: { getClientAddress(): string }): boolean {
	if (!mailboxEnabled()) return false;
	try {
		return isLoopbackAddress(event.getClientAddress());
	} catch {
		return false;
	}
}

export async function readMailbox(limit = 200): Promise<StoredMail[]> {
	const dir = env.DEV_MAILBOX_DIR;
	if (!dir) return [];
	const names = (await readdir(dir).catch(() => [] as string[]))
		.filter((n) => n.endsWith('.json'))
		.sort()
		.reverse()
		.slice(0, limit);
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
