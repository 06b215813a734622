/**
 * Sign-in, sessions, sign-out, invites, password resets and API tokens, over HTTP against the built server.
 * Password rules follow NIST SP 800-63B (length floor, breached-password list, throttling);
 * session handling follows OWASP ASVS 4.0 V3 (server-side invalidation on sign-out and reset).
 */
import { describe, expect, test } from 'vitest';
import {
	DEMO_PASSWORD,
	Visitor,
	baseUrl,
	demo,
	linkIn,
	mailTo,
	signedIn,
	sql
} from '../helpers/http';

describe('sign-in', () => {
	test('a crew member signs in with e-mail and password and /api/me names them, their channel and roles', async () => {
		const visitor = await signedIn(demo.producer);
		const me = await visitor.api('/api/me');
		expect(me.status).toBe(200);
		expect(me.body.person.email).toBe(demo.producer);
		expect(me.body.channel.name).toBe('Torquehaven Garage');
		expect(me.body.roles).toEqual(['producer']);
		expect(me.body.via).toBe('session');
	});

	test('a wrong password is refused with a plain message and keeps the typed e-mail', async () => {
		const visitor = new Visitor();
		const result = await visitor.action('/signin', {
			email: demo.host,
			password: 'not the password at all'
		});
		expect(result.type).toBe('failure');
		expect(result.status).toBe(400);
		expect(result.data.errors.form[0]).toMatch(/don't match/);
		expect(result.data.values.email).toBe(demo.host);
		expect((await visitor.api('/api/me')).status).toBe(401);
	});

	test('an empty e-mail gets a field-level message', async () => {
		const result = await new Visitor().action('/signin', { email: '', password: 'x' });
		expect(result.status).toBe(400);
		expect(result.data.errors.email[0]).toMatch(/e-mail/i);
	});

	test('guessing is throttled after ten failures for one address (NIST SP 800-63B rate limiting)', async () => {
		await sql(
			`INSERT INTO person (email, name, password_hash) VALUES ('throttle@example.test', 'Throttle Test', NULL)`
		);
		const visitor = new Visitor('127.0.5.1'); // a client of its own: the suite's 127.0.0.1 keeps its budget
		let last: Awaited<ReturnType<Visitor['action']>> | null = null;
		for (let i = 0; i < 11; i++)
			last = await visitor.action('/signin', {
				email: 'throttle@example.test',
				password: `guess number ${i}`
			});
		expect(last?.status).toBe(429);
		expect(last?.data.errors.form[0]).toMatch(/Too many tries/);
	});

	test('sign-out ends the session on the server: the old cookie no longer works', async () => {
		const visitor = await signedIn(demo.editor);
		const copied = new Visitor();
		copied.cookies = new Map(visitor.cookies);
		const out = await visitor.request('/signout', { method: 'POST', form: {} });
		expect(out.status).toBe(303);
		expect((await copied.api('/api/me')).status).toBe(401);
	});

	test('a forged session cookie is treated as signed out', async () => {
		const visitor = new Visitor();
		visitor.cookies.set(
			'authjs.session-token',
			'eyJhbGciOiJkaXIiLCJlbmMiOiJBMjU2Q0JDLUhTNTEyIn0..forged.forged.forged'
		);
		const me = await visitor.api('/api/me');
		expect(me.status).toBe(401);
		expect(me.body.error).toMatch(/Sign in/);
		const page = await visitor.request('/crew');
		expect(page.status).toBe(303);
		expect(page.headers.get('location')).toMatch(/^\/signin\?next=/);
	});
});

describe('where sign-in sends you next', () => {
	// Browsers read "\\" in a URL as "/" (WHATWG URL Standard, special schemes), so "/\\host" and
	// "//host" both name another host: an open redirect if followed (OWASP Unvalidated Redirects).
	// Dot segments (also "%2e") are removed after parsing, so "/..//host" normalises to "//host".
	const offSite = [
		'//evil.example/x',
		'/\\evil.example/x',
		'https://evil.example/x',
		'/\t/evil.example',
		'/..//evil.example/login',
		'/%2e%2e//evil.example/login',
		'/a/../..//evil.example/login',
		'/%2e//',
		'javascript:alert(1)'
	];

	test('a signed-in visitor sent to /signin?next=… stays on this site', async () => {
		const visitor = await signedIn(demo.host);
		for (const next of offSite) {
			const answer = await visitor.request(`/signin?next=${encodeURIComponent(next)}`);
			expect(answer.status, next).toBe(303);
			const location = answer.headers.get('location')!;
			expect(new URL(location, baseUrl()).origin, next).toBe(baseUrl());
		}
		const inside = await visitor.request(`/signin?next=${encodeURIComponent('/parts?q=coil')}`);
		expect(inside.headers.get('location')).toBe('/parts?q=coil');
	});

	test('signing in with an off-site next lands on the bench; an on-site next is kept', async () => {
		for (const next of offSite) {
			const visitor = new Visitor();
			const answer = await visitor.request('/signin', {
				method: 'POST',
				form: { email: demo.host, password: DEMO_PASSWORD, next }
			});
			expect(answer.status, next).toBe(303);
			expect(new URL(answer.headers.get('location')!, baseUrl()).origin, next).toBe(baseUrl());
		}
		const visitor = new Visitor();
		const answer = await visitor.request('/signin', {
			method: 'POST',
			form: { email: demo.host, password: DEMO_PASSWORD, next: '/episodes' }
		});
		expect(answer.headers.get('location')).toBe('/episodes');
	});

	test('a signed-out visit is sent to sign-in with a next that stays on this site', async () => {
		const answer = await new Visitor().request('/parts?q=coil%20spring');
		expect(answer.status).toBe(303);
		const location = new URL(answer.headers.get('location')!, baseUrl());
		expect(location.pathname).toBe('/signin');
		expect(location.searchParams.get('next')).toBe('/parts?q=coil%20spring');
	});

	test('the channel switcher returns to the same section of the new channel, never off the site', async () => {
		const editor = await signedIn(demo.editor); // on two crews
		const me = await editor.api('/api/me');
		const other = me.body.channels.find((c: { id: string }) => c.id !== me.body.channel.id);
		for (const next of offSite) {
			const answer = await editor.request('/channel?/switch', {
				method: 'POST',
				form: { channelId: other.id, next }
			});
			expect(answer.status, next).toBe(303);
			expect(answer.headers.get('location'), next).toBe('/');
		}
		// A record of the old channel is not found in the new one: the switcher keeps only the section.
		const answer = await editor.request('/channel?/switch', {
			method: 'POST',
			form: { channelId: me.body.channel.id, next: '/parts/1234?tab=links' }
		});
		expect(answer.headers.get('location')).toBe('/parts');
	});
});

describe('crew management', () => {
	test('an invite arrives by mail, its link sets a password, and the invitee signs in with their roles', async () => {
		const producer = await signedIn(demo.producer);
		const started = Date.now() - 1000;
		const invited = await producer.api('/api/crew', {
			method: 'POST',
			json: {
				email: 'lena.invite@example.test',
				name: 'Lena Brightwater',
				roles: ['camera', 'merch']
			}
		});
		expect(invited.status).toBe(201);
		const mail = await mailTo('lena.invite@example.test', { after: started });
		expect(mail.subject).toMatch(/Torquehaven Garage/);
		const link = new URL(linkIn(mail.text));
		expect(link.pathname).toMatch(/^\/welcome\//);

		const invitee = new Visitor();
		const tooShort = await invitee.action(link.pathname, { password: 'short', confirm: 'short' });
		expect(tooShort.status).toBe(400);
		expect(tooShort.data.errors.password[0]).toMatch(/at least 15/);
		const breached = await invitee.action(link.pathname, {
			password: 'passwordpassword',
			confirm: 'passwordpassword'
		});
		expect(breached.status).toBe(400);
		expect(breached.data.errors.password[0]).toMatch(/leaked/);
		const set = await invitee.action(link.pathname, {
			password: 'three blocks and a shackle',
			confirm: 'three blocks and a shackle'
		});
		expect(set.type).toBe('redirect');

		const again = await invitee.action(link.pathname, {
			password: 'three blocks and a shackle',
			confirm: 'three blocks and a shackle'
		});
		expect(again.status).toBe(404); // the link works once

		const signedInInvitee = new Visitor();
		expect(
			(await signedInInvitee.signIn('lena.invite@example.test', 'three blocks and a shackle'))
				.status
		).toBe(303);
		const me = await signedInInvitee.api('/api/me');
		expect(me.body.roles.sort()).toEqual(['camera', 'merch']);
	});

	test('inviting someone already on the crew answers 409', async () => {
		const producer = await signedIn(demo.producer);
		const again = await producer.api('/api/crew', {
			method: 'POST',
			json: { email: demo.host, name: 'Rico again', roles: ['host'] }
		});
		expect(again.status).toBe(409);
		expect(again.body.error).toMatch(/already on the Torquehaven Garage crew/);
	});

	test('a disabled account loses access on its next request, and regains it when enabled', async () => {
		const producer = await signedIn(demo.producer);
		await producer.api('/api/crew', {
			method: 'POST',
			json: { email: 'temp.disable@example.test', name: 'Temp Hand', roles: ['host'] }
		});
		const [row] = await sql(`SELECT id FROM person WHERE email = 'temp.disable@example.test'`);
		await sql(
			`UPDATE person SET password_hash = (SELECT password_hash FROM person WHERE email = $1) WHERE id = $2`,
			[demo.host, row.id]
		);
		const temp = await signedIn('temp.disable@example.test');
		expect((await temp.api('/api/me')).status).toBe(200);

		const disabled = await producer.api(`/api/crew/${row.id}`, {
			method: 'PATCH',
			json: { disabled: true }
		});
		expect(disabled.status).toBe(200);
		expect((await temp.api('/api/me')).status).toBe(401);
		expect((await new Visitor().signIn('temp.disable@example.test')).status).toBe(400);

		await producer.api(`/api/crew/${row.id}`, { method: 'PATCH', json: { disabled: false } });
		expect((await temp.api('/api/me')).status).toBe(200);
	});

	test('the last producer cannot drop their own producer role', async () => {
		const producer = await signedIn(demo.producer);
		const me = await producer.api('/api/me');
		const result = await producer.api(`/api/crew/${me.body.person.id}`, {
			method: 'PATCH',
			json: { roles: ['host'] }
		});
		expect(result.status).toBe(409);
		expect(result.body.error).toMatch(/only producer/);
	});

	test('a password reset link sets a new password and ends every open session', async () => {
		await sql(`INSERT INTO person (email, name) VALUES ('reset.me@example.test', 'Reset Me')`);
		const [person] = await sql(`SELECT id FROM person WHERE email = 'reset.me@example.test'`);
		const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
		await sql(`INSERT INTO membership (channel_id, person_id, roles) VALUES ($1, $2, '{host}')`, [
			channel.id,
			person.id
		]);
		await sql(
			`UPDATE person SET password_hash = (SELECT password_hash FROM person WHERE email = $1) WHERE id = $2`,
			[demo.host, person.id]
		);
		const oldSession = await signedIn('reset.me@example.test');

		const started = Date.now() - 1000;
		const asked = await new Visitor().action('/reset', { email: 'reset.me@example.test' });
		expect(asked.data.sent).toBe(true);
		const unknown = await new Visitor().action('/reset', { email: 'nobody.here@example.test' });
		expect(unknown.data.sent).toBe(true); // same answer: no account enumeration
		const mail = await mailTo('reset.me@example.test', { after: started });
		const link = new URL(linkIn(mail.text));
		const done = await new Visitor().action(link.pathname, {
			password: 'new springs on the rear axle',
			confirm: 'new springs on the rear axle'
		});
		expect(done.type).toBe('redirect');
		expect((await oldSession.api('/api/me')).status).toBe(401);
		expect((await new Visitor().signIn('reset.me@example.test', DEMO_PASSWORD)).status).toBe(400);
		expect(
			(await new Visitor().signIn('reset.me@example.test', 'new springs on the rear axle')).status
		).toBe(303);
	});
});

describe('personal API tokens', () => {
	test('a token is shown once, works as Bearer, is stored hashed, and stops working when revoked', async () => {
		const editor = await signedIn(demo.editor);
		const created = await editor.api('/api/tokens', {
			method: 'POST',
			json: { label: 'graphics laptop' }
		});
		expect(created.status).toBe(201);
		const secret: string = created.body.token.token;
		expect(secret).toMatch(/^wr_/);

		const stored = await sql(`SELECT token_hash FROM api_token WHERE id = $1`, [
			created.body.token.id
		]);
		expect(stored[0].token_hash).not.toContain(secret);
		const listed = await editor.api('/api/tokens');
		expect(JSON.stringify(listed.body)).not.toContain(secret);

		const viaToken = new Visitor();
		const me = await viaToken.api('/api/me', { headers: { authorization: `Bearer ${secret}` } });
		expect(me.status).toBe(200);
		expect(me.body.via).toBe('token');
		expect(me.body.person.email).toBe(demo.editor);

		expect(
			(await editor.api(`/api/tokens/${created.body.token.id}`, { method: 'DELETE' })).status
		).toBe(204);
		const revoked = await viaToken.api('/api/me', {
			headers: { authorization: `Bearer ${secret}` }
		});
		expect(revoked.status).toBe(401);
		expect(revoked.body.error).toMatch(/revoked/);
	});
});
