/**
 * The per-client sign-in limit counts by the connecting address. IPv4 addresses count one by one.
 * An IPv6 host usually holds a whole /64 (RFC 4291 §2.5.4: global unicast addresses carry a 64-bit
 * interface identifier; RFC 8981 temporary addresses change it at will), so IPv6 counts by /64.
 * IPv4-mapped IPv6 (::ffff:a.b.c.d, RFC 4291 §2.5.5.2) is the IPv4 address. Examples use the
 * documentation ranges of RFC 5737 (192.0.2.0/24, 203.0.113.0/24) and RFC 3849 (2001:db8::/32).
 */
import { describe, expect, test } from 'vitest';
import { clientKey, connectingAddress } from '$lib/server/auth/client-address';

describe('clientKey', () => {
	test('an IPv4 address is its own client, also when written IPv4-mapped', () => {
		expect(clientKey('203.0.113.9')).toBe('203.0.113.9');
		expect(clientKey('::ffff:203.0.113.9')).toBe('203.0.113.9');
		expect(clientKey('::FFFF:203.0.113.9')).toBe('203.0.113.9');
		expect(clientKey('203.0.113.10')).not.toBe(clientKey('203.0.113.9'));
	});

	test('IPv6 addresses in one /64 are one client, however they are written', () => {
		const key = clientKey('2001:db8:1:2::1');
		expect(clientKey('2001:db8:1:2:aaaa:bbbb:cccc:dddd')).toBe(key);
		expect(clientKey('2001:0DB8:0001:0002:0:0:0:ffff')).toBe(key);
		expect(clientKey('2001:db8:1:3::1')).not.toBe(key);
		expect(clientKey('::1')).toBe(clientKey('::2'));
	});

	test('something that is not an address is kept as one opaque client, bounded in length', () => {
		expect(clientKey('not-an-address')).toBe(clientKey('not-an-address'));
		expect(clientKey('x'.repeat(5000)).length).toBeLessThanOrEqual(100);
	});

	test('a request without the configured address header counts as one shared client instead of failing', () => {
		// adapter-node throws from getClientAddress when ADDRESS_HEADER names a header the request lacks.
		const missing = {
			getClientAddress(): string {
				throw new Error('Address header was specified with ADDRESS_HEADER=x-forwarded-for');
			}
		};
		expect(connectingAddress(missing)).toBe(connectingAddress(missing));
		expect(connectingAddress({ getClientAddress: () => '203.0.113.9' })).toBe('203.0.113.9');
	});
});
