/**
 * The dev mailbox answers only callers on this machine. Loopback per RFC 1122 §3.2.1.3 (all of
 * 127.0.0.0/8) and RFC 4291 §2.5.3 (::1), also as IPv4-mapped IPv6 (RFC 4291 §2.5.5.2, the form a
 * dual-stack Node.js socket reports). Non-loopback examples are the documentation ranges of
 * RFC 5737 (192.0.2.0/24) and RFC 3849 (2001:db8::/32), and private space of RFC 1918.
 */
import { describe, expect, test } from 'vitest';
import { isLoopbackAddress } from '$lib/server/mail/mailbox';

describe('isLoopbackAddress', () => {
	test('every address of 127.0.0.0/8, ::1, and their IPv4-mapped forms are loopback', () => {
		for (const address of [
			'127.0.0.1',
			'127.0.0.2',
			'127.255.255.254',
			'::1',
			'::ffff:127.0.0.1',
			'::FFFF:127.1.2.3'
		]) {
			expect(isLoopbackAddress(address), address).toBe(true);
		}
	});

	test('documentation, private and unspecified addresses are not', () => {
		for (const address of [
			'192.0.2.10',
			'10.0.0.5',
			'192.168.1.20',
			'128.0.0.1',
			'0.0.0.0',
			'::',
			'2001:db8::1',
			'::ffff:192.0.2.10',
			'fe80::1'
		]) {
			expect(isLoopbackAddress(address), address).toBe(false);
		}
	});

	test('something that is not an address is not loopback', () => {
		for (const address of ['', 'localhost', '127.0.0.1; rm', '999.0.0.1']) {
			expect(isLoopbackAddress(address), address).toBe(false);
		}
	});
});
