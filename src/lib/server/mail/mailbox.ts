/**
 * The dev-only mailbox: reads what the loopback fake mail server stored. The mail holds live invite
 * and password-reset links, so it exists only when asked for (DEV_MAILBOX=1, which the demo start
 * command and the tests set, plus the DEV_MAILBOX_DIR they store mail in) and never behind a
 * proxy (ADDRESS_HEADER set). It answers only a browser on this machine that reached the server
 * directly: the connection comes from loopback, no forwarding header says a proxy relayed it
 * (a same-host proxy connects from loopback for everyone), and the Host is a loopback name (a
 * DNS-rebinding page would send its own).
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

export const mailboxEnabled = () =>
	env.DEV_MAILBOX === '1' && Boolean(env.DEV_MAILBOX_DIR) && !env.ADDRESS_HEADER;

/**
 * Headers a proxy adds when it relays a request: RFC 7239 Forwarded, the de-facto X-Forwarded-*
 * and X-Real-IP family and the client-address headers of common proxies and CDNs, RFC 9110 Via.
 */
const FORWARDING_HEADERS = [
	'forwarded',
	'x-forwarded-for',
	'x-forwarded-host',
	'x-forwarded-proto',
	'x-forwarded-port',
	'x-forwarded-server',
	'x-original-forwarded-for',
	'x-real-ip',
	'x-client-ip',
	'x-cluster-client-ip',
	'true-client-ip',
	'cf-connecting-ip',
	'fastly-client-ip',
	'via'
];

/** The first forwarding header the request carries, or null for a request made directly. */
export function forwardingHeaderIn(headers: Headers): string | null {
	return FORWARDING_HEADERS.find((name) => headers.has(name)) ?? null;
}

/** A Host header naming this machine: localhost, an address of 127.0.0.0/8 or [::1], with or without a port. */
export function isLoopbackHost(host: string | null): boolean {
	if (!host) return false;
	const name = /^(\[[^\]]*\]|[^:]*)(?::\d{1,5})?$/.exec(host.trim())?.[1]?.toLowerCase();
	if (!name) return false;
	if (name === 'localhost') return true;
	if (name.startsWith('[')) return name === '[::1]';
	return /^\d+\.\d+\.\d+\.\d+$/.test(name) && isLoopbackAddress(name);
}

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

/** The mailbox is on, and the caller is a browser on this machine that connected directly. */
export function mailboxOpenTo(event: { getClientAddress(): string; request: Request }): boolean {
	if (!mailboxEnabled()) return false;
	const { headers } = event.request;
	if (forwardingHeaderIn(headers) || !isLoopbackHost(headers.get('host'))) return false;
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
