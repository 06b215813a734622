/**
 * Guessing and reset mail are limited per e-mail address and per client, atomically, and the owner
 * of an attacked address can still get in (NIST SP 800-63B §5.2.2 rate limiting; OWASP ASVS 4.0.3
 * V2.2.1 anti-automation). Throttled answers are 429 with Retry-After in seconds (RFC 6585 §4,
 * RFC 9110 §10.2.3). The production limits are tested as they ship: each test acts from a loopback
 * source address of its own (127.0.x.y), so it neither meets nor uses up the 127.0.0.1 budget
 * that the rest of the suite signs in from.
 */
import { describe, expect, test } from 'vitest';
import {
	DEMO_PASSWORD,
	Visitor,
	baseUrl,
	demo,
	linkIn,
	mailTo,
	requestFrom,
	sql
} from '../helpers/http';
import { THROTTLE_LIMITS } from '../../src/lib/server/auth/throttle-limits';

/** A crew member of Torquehaven Garage whose password is the demo password. */
async function crewMember(email: string) {
	const [person] = await sql(
		`INSERT INTO person (email, name, password_hash)
		 SELECT $1, 'Throttle Test', password_hash FROM person WHERE email = $2 RETURNING id`,
		[email, demo.host]
	);
	await sql(
		`INSERT INTO membership (channel_id, person_id, roles)
		 SELECT id, $1, '{host}' FROM channel WHERE name = 'Torquehaven Garage'`,
		[person.id]
	);
}

const guess = (visitor: Visitor, email: string, password: string) =>
	visitor.action('/signin', { email, password });

function expectRetryAfter(response: Response, windowSeconds: number) {
	const seconds = Number(response.headers.get('retry-after'));
	expect(Number.isInteger(seconds), String(response.headers.get('retry-after'))).toBe(true);
	expect(seconds).toBeGreaterThan(0);
	expect(seconds).toBeLessThanOrEqual(windowSeconds);
}

describe('sign-in throttling', () => {
	test('40 wrong guesses at once for one address, from 40 clients: no more than the per-address limit are checked', async () => {
		const email = 'atomic.guess@example.test';
		await crewMember(email);
		const answers = await Promise.all(
			Array.from({ length: 40 }, (_, i) =>
				guess(new Visitor(`127.0.6.${i + 1}`), email, `wrong guess number ${i}`)
			)
		);
		const checked = answers.filter((a) => a.status === 400).length;
		const throttled = answers.filter((a) => a.status === 429).length;
		expect(checked + throttled).toBe(40);
		expect(checked).toBeGreaterThan(0);
		expect(checked).toBeLessThanOrEqual(THROTTLE_LIMITS.signInAddress.limit);
		// Even the right password is not checked now: the address waits out its window.
		expect((await guess(new Visitor('127.0.6.99'), email, DEMO_PASSWORD)).status).toBe(429);
	});

	test('one client guessing many addresses at once is stopped at the per-client limit', async () => {
		const client = '127.0.8.1';
		const answers = await Promise.all(
			Array.from({ length: 30 }, (_, i) =>
				guess(new Visitor(client), `nobody.${i}@spray.example.test`, 'password guess one')
			)
		);
		const checked = answers.filter((a) => a.status === 400).length;
		expect(checked).toBeGreaterThan(0);
		expect(checked).toBeLessThanOrEqual(THROTTLE_LIMITS.signInClient.limit);
		expect(answers.filter((a) => a.status === 429)).toHaveLength(30 - checked);

		// The next try, for a real account with its right password, waits too: from this client
		// nothing is checked until the window ends.
		const visitor = new Visitor(client);
		const enhanced = await visitor.request('/signin', {
			method: 'POST',
			form: { email: demo.host, password: DEMO_PASSWORD },
			headers: { accept: 'application/json', 'x-sveltekit-action': 'true' }
		});
		expect(enhanced.status).toBe(429);
		expectRetryAfter(enhanced, THROTTLE_LIMITS.signInClient.windowSeconds);
		const body = await enhanced.json();
		expect(body.status).toBe(429);
		expect(body.data).toMatch(/Too many/);

		// Without JavaScript: the sign-in page itself, with the message and the same header.
		const page = await visitor.request('/signin', {
			method: 'POST',
			form: { email: demo.host, password: DEMO_PASSWORD }
		});
		expect(page.status).toBe(429);
		expectRetryAfter(page, THROTTLE_LIMITS.signInClient.windowSeconds);
		const html = await page.text();
		expect(html).toMatch(/Too many failed sign-ins from your network/);
		expect(html).toMatch(/action="\/unlock"/);

		// A script posting straight to Auth.js's endpoint gets JSON.
		const scripted = await requestFrom(client, `${baseUrl()}/auth/callback/credentials`, {
			method: 'POST',
			headers: new Headers({
				origin: baseUrl(),
				'content-type': 'application/x-www-form-urlencoded'
			}),
			body: new URLSearchParams({ email: demo.host, password: DEMO_PASSWORD }).toString()
		});
		expect(scripted.status).toBe(429);
		expectRetryAfter(scripted, THROTTLE_LIMITS.signInClient.windowSeconds);
		expect((await scripted.json()).error).toMatch(/Too many/);
	});

	test('the owner gets in through a mailed unlock link while the attacker stays throttled', async () => {
		const email = 'owner.unlock@example.test';
		await crewMember(email);
		// Attacker and owner share one client (an office behind one address).
		const attacker = new Visitor('127.0.9.1');
		for (let i = 0; i < THROTTLE_LIMITS.signInAddress.limit; i++)
			expect((await guess(attacker, email, `attacker guess ${i}`)).status).toBe(400);
		expect((await guess(attacker, email, 'attacker guess again')).status).toBe(429);

		const owner = new Visitor('127.0.9.1');
		const refused = await guess(owner, email, DEMO_PASSWORD);
		expect(refused.status).toBe(429);
		expect(refused.data.errors.form[0]).toMatch(/unlock link/);

		const started = Date.now() - 1000;
		const asked = await owner.action('/unlock', { email });
		expect(asked.data.sent).toBe(true);
		const mail = await mailTo(email, { after: started });
		expect(mail.subject).toMatch(/[Uu]nlock/);
		const link = new URL(linkIn(mail.text));
		expect(link.pathname).toMatch(/^\/unlock\/[\w-]+$/);

		// Opening the link (as a mail scanner would) changes nothing; the button does.
		const page = await owner.request(link.pathname);
		expect(page.status).toBe(200);
		expect(await page.text()).toContain(email);
		const unlocked = await owner.request(link.pathname, { method: 'POST', form: {} });
		expect(unlocked.status).toBe(303);
		expect(unlocked.headers.get('location')).toBe('/signin?unlocked=1');

		const signIn = await owner.signIn(email);
		expect(signIn.status).toBe(303);
		expect((await owner.api('/api/me')).body.person.email).toBe(email);

		// The attacker, without the owner's mailbox, is still held back.
		expect((await guess(attacker, email, 'attacker guess after')).status).toBe(429);
		expect((await guess(attacker, email, DEMO_PASSWORD)).status).toBe(429);
		// The link worked once.
		const again = await new Visitor('127.0.9.2').request(link.pathname, {
			method: 'POST',
			form: {}
		});
		expect(again.status).toBe(404);
	});

	test('a crew member signing in again and again is never throttled: only failures count', async () => {
		const email = 'often.here@example.test';
		await crewMember(email);
		const rounds =
			Math.max(THROTTLE_LIMITS.signInAddress.limit, THROTTLE_LIMITS.signInClient.limit) + 5;
		for (let i = 0; i < rounds; i++)
			expect((await new Visitor('127.0.10.1').signIn(email)).status, `sign-in ${i + 1}`).toBe(303);
	});
});

describe('reset mail throttling', () => {
	const outboxFor = async (address: string) =>
		Number((await sql(`SELECT count(*) AS n FROM outbox WHERE to_address = $1`, [address]))[0].n);

	test('20 reset requests at once for one address queue at most the per-address limit of mails', async () => {
		const email = 'many.resets@example.test';
		await crewMember(email);
		const answers = await Promise.all(
			Array.from({ length: 20 }, (_, i) =>
				new Visitor(`127.0.11.${i + 1}`).action('/reset', { email })
			)
		);
		const sent = answers.filter((a) => a.data?.sent === true).length;
		expect(sent).toBeGreaterThan(0);
		expect(sent).toBeLessThanOrEqual(THROTTLE_LIMITS.mailAddress.limit);
		expect(answers.filter((a) => a.status === 429)).toHaveLength(20 - sent);
		expect(await outboxFor(email)).toBe(sent);
		const refused = answers.find((a) => a.status === 429)!;
		expect(refused.data.errors.form[0]).toMatch(/Too many/);
	});

	test('one client asking for resets of many addresses is stopped at the per-client limit', async () => {
		const client = '127.0.12.1';
		const answers = await Promise.all(
			Array.from({ length: 15 }, (_, i) =>
				new Visitor(client).action('/reset', { email: `reset.spray.${i}@example.test` })
			)
		);
		const sent = answers.filter((a) => a.data?.sent === true).length;
		expect(sent).toBeLessThanOrEqual(THROTTLE_LIMITS.mailClient.limit);
		expect(answers.filter((a) => a.status === 429)).toHaveLength(15 - sent);
		const page = await new Visitor(client).request('/reset', {
			method: 'POST',
			form: { email: 'one.more@example.test' }
		});
		expect(page.status).toBe(429);
		expectRetryAfter(page, THROTTLE_LIMITS.mailClient.windowSeconds);
		expect(await page.text()).toMatch(/Too many/);
	});
});
