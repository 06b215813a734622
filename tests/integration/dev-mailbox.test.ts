/**
 * The dev mailbox (/dev/mail) holds live invite and reset links. It exists only when DEV_MAILBOX=1
 * is set (the demo start command sets it; the test server too), and it answers only a browser on
 * this machine that reached the server directly: a request that a proxy forwarded carries
 * forwarding headers (RFC 7239 "Forwarded", the de-facto X-Forwarded-For and X-Real-IP, RFC 9110
 * §7.6.3 "Via") and is refused, whatever the socket address says. A Host that is not a loopback
 * name is refused too (a DNS-rebinding page would send its own host name).
 */
import { afterAll, describe, expect, inject, test } from 'vitest';
import { startServer, stopServer } from '../helpers/global-setup';
import { freePort, waitForHttp } from '../helpers/net';
import { Visitor, baseUrl, linkIn, mailTo, requestFrom } from '../helpers/http';

const paths = ['/dev/mail', '/dev/mail/messages.json'];

describe('the dev mailbox', () => {
	test('a direct request from this machine reads the mail', async () => {
		for (const path of paths) expect((await fetch(baseUrl() + path)).status, path).toBe(200);
	});

	test('a request relayed by a same-host reverse proxy is refused, even with a live reset link inside', async () => {
		// A reset mail sits in the mailbox, as in the reported case.
		const started = Date.now() - 1000;
		await new Visitor('127.0.0.41').action('/reset', { email: 'mika@torquehaven.test' });
		const mail = await mailTo('mika@torquehaven.test', { after: started });
		expect(linkIn(mail.text)).toMatch(/\/reset\//);

		const forwarded: Record<string, string>[] = [
			{ 'x-forwarded-for': '203.0.113.9' },
			{ forwarded: 'for=203.0.113.9;proto=https' },
			{ 'x-real-ip': '203.0.113.9' },
			{ 'x-forwarded-host': 'crew.example' },
			{ 'x-forwarded-proto': 'https' },
			{ via: '1.1 proxy.example' },
			{ 'x-forwarded-for': '127.0.0.1' } // even one naming loopback: it was still relayed
		];
		for (const headers of forwarded) {
			for (const path of paths) {
				const answer = await fetch(baseUrl() + path, { headers });
				expect(answer.status, `${path} ${JSON.stringify(headers)}`).toBe(404);
				expect(await answer.text()).not.toContain('/reset/');
			}
		}
	});

	test('a request naming another host (DNS rebinding) is refused; loopback names are fine', async () => {
		const port = new URL(baseUrl()).port;
		for (const host of [`rebind.example:${port}`, `203.0.113.9:${port}`]) {
			const answer = await requestFrom('127.0.0.1', `${baseUrl()}/dev/mail/messages.json`, {
				headers: new Headers({ host })
			});
			expect(answer.status, host).toBe(404);
		}
		for (const host of [`localhost:${port}`, `127.0.0.1:${port}`]) {
			const answer = await requestFrom('127.0.0.1', `${baseUrl()}/dev/mail/messages.json`, {
				headers: new Headers({ host })
			});
			expect(answer.status, host).toBe(200);
		}
	});
});

describe('a server started without DEV_MAILBOX=1', () => {
	let server: ReturnType<typeof startServer> | null = null;
	afterAll(async () => {
		if (server) await stopServer(server);
	});

	test('has no mailbox, even with a mail folder configured and a loopback caller', async () => {
		const port = await freePort();
		const base = `http://127.0.0.1:${port}`;
		const env: Record<string, string> = {
			...inject('serverEnv'),
			PORT: String(port),
			ORIGIN: base
		};
		delete env.DEV_MAILBOX; // DEV_MAILBOX_DIR stays: the folder alone must not open it
		server = startServer(env);
		await waitForHttp(`${base}/healthz`, 30_000);
		for (const path of paths) expect((await fetch(base + path)).status, path).toBe(404);
	});
});
