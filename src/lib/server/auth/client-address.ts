/**
 * Which client a request counts against for throttling: the connecting address as adapter-node
 * reports it (the socket's address, or the header named by ADDRESS_HEADER behind a proxy).
 * An IPv6 host usually holds a whole /64 (RFC 4291 §2.5.4; RFC 8981 temporary addresses rotate
 * within it), so IPv6 counts by /64; IPv4-mapped IPv6 (RFC 4291 §2.5.5.2) counts as IPv4.
 */
import { isIPv4, isIPv6 } from 'node:net';

/** Eight 16-bit groups of a valid IPv6 address, embedded IPv4 tail included. */
function ipv6Groups(address: string): number[] {
	let text = address.toLowerCase();
	const ipv4Tail = /(\d+\.\d+\.\d+\.\d+)$/.exec(text)?.[1];
	if (ipv4Tail) {
		const [a, b, c, d] = ipv4Tail.split('.').map(Number);
		text =
			text.slice(0, -ipv4Tail.length) +
			`${((a << 8) | b).toString(16)}:${((c << 8) | d).toString(16)}`;
	}
	const [head, tail] = text.includes('::') ? text.split('::') : [text, undefined];
	const front = head ? head.split(':') : [];
	const back = tail ? tail.split(':') : [];
	const missing = tail === undefined ? 0 : 8 - front.length - back.length;
	return [...front, ...Array<string>(missing).fill('0'), ...back].map((group) =>
		parseInt(group, 16)
	);
}

export function clientKey(address: string): string {
	const plain = address.replace(/%.*$/, ''); // an IPv6 zone ("fe80::1%eth0") names no other host
	const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(plain)?.[1];
	if (mapped && isIPv4(mapped)) return mapped;
	if (isIPv4(plain)) return plain;
	if (isIPv6(plain)) {
		const prefix = ipv6Groups(plain)
			.slice(0, 4)
			.map((group) => group.toString(16))
			.join(':');
		return `${prefix}::/64`;
	}
	return `other:${plain.slice(0, 90)}`;
}

/**
 * The connecting address as adapter-node reports it. With ADDRESS_HEADER set, adapter-node throws
 * when a request lacks that header (it did not come through the proxy); such requests count
 * together as one client instead of failing.
 */
export function connectingAddress(event: { getClientAddress(): string }): string {
	try {
		return event.getClientAddress();
	} catch {
		return 'without-address-header';
	}
}
