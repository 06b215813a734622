/**
 * The dev mailbox answers only a browser on this machine that reached the server directly, and only
 * when asked for. Forwarding headers: RFC 7239 (Forwarded), the de-facto X-Forwarded-For,
 * X-Forwarded-Host, X-Forwarded-Proto and X-Real-IP (common practice of reverse proxies), RFC 9110
 * §7.6.3 (Via). Loopback names: RFC 6761 §6.3 (localhost), RFC 1122 §3.2.1.3 (127.0.0.0/8),
 * RFC 4291 §2.5.3 (::1, written in brackets in a Host header per RFC 3986 §3.2.2).
 */
import { describe, expect, test } from 'vitest';
import { forwardingHeaderIn, isLoopbackHost } from '$lib/server/mail/mailbox';
import { demoMailbox } from '../../scripts/lib/dev-mailbox';

describe('forwardingHeaderIn', () => {
	test('names the forwarding header a relayed request carries', () => {
		for (const [name, value] of [
			['X-Forwarded-For', '203.0.113.9'],
			['Forwarded', 'for=203.0.113.9'],
			['X-Real-IP', '203.0.113.9'],
			['X-Forwarded-Host', 'crew.example'],
			['X-Forwarded-Proto', 'https'],
			['Via', '1.1 proxy.example'],
			['True-Client-IP', '203.0.113.9'],
			['CF-Connecting-IP', '203.0.113.9']
		]) {
			expect(forwardingHeaderIn(new Headers({ [name]: value })), name).toBe(name.toLowerCase());
		}
	});

	test('finds none in a browser request made directly', () => {
		const direct = new Headers({
			host: '127.0.0.1:3100',
			'user-agent': 'Mozilla/5.0',
			accept: 'text/html',
			cookie: 'a=b',
			referer: 'http://127.0.0.1:3100/'
		});
		expect(forwardingHeaderIn(direct)).toBeNull();
	});
});

describe('isLoopbackHost', () => {
	test('loopback names and addresses, with or without a port, are loopback', () => {
		for (const host of [
			'localhost',
			'localhost:3100',
			'LOCALHOST:3100',
			'127.0.0.1',
			'127.0.0.1:3100',
			'127.1.2.3:80',
			'[::1]',
			'[::1]:3100'
		])
			expect(isLoopbackHost(host), host).toBe(true);
	});

	test('any other host, or none, is not', () => {
		for (const host of [
			null,
			'',
			'rebind.example:3100',
			'localhost.rebind.example',
			'127.0.0.1.rebind.example',
			'203.0.113.9:3100',
			'[2001:db8::1]:3100',
			'0.0.0.0:3100'
		])
			expect(isLoopbackHost(host), String(host)).toBe(false);
	});
});

describe('the demo start command', () => {
	test('turns the mailbox on for the local demo: fake mail, listening on loopback', () => {
		expect(demoMailbox({})).toEqual({ fakeMail: true, mailbox: true });
		expect(demoMailbox({ HOST: '127.0.0.1' })).toEqual({ fakeMail: true, mailbox: true });
		expect(demoMailbox({ HOST: 'localhost' })).toEqual({ fakeMail: true, mailbox: true });
	});

	test('leaves it off when mail goes to a real relay, when told so, or when serving the network', () => {
		expect(demoMailbox({ SMTP_URL: 'smtp://relay.example:587' }).mailbox).toBe(false);
		expect(demoMailbox({ DEV_MAILBOX: '0' }).mailbox).toBe(false);
		expect(demoMailbox({ HOST: '0.0.0.0' }).mailbox).toBe(false);
		expect(demoMailbox({ HOST: '192.0.2.10' }).mailbox).toBe(false);
		expect(demoMailbox({ HOST: '0.0.0.0', DEV_MAILBOX: '1' }).mailbox).toBe(true);
	});

	test('keeps the fake mail server whenever no relay is set', () => {
		expect(demoMailbox({ HOST: '0.0.0.0' }).fakeMail).toBe(true);
		expect(demoMailbox({ SMTP_URL: 'smtp://relay.example:587' }).fakeMail).toBe(false);
	});
});
