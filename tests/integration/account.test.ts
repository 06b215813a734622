/**
 * Account: a person changes the name the crew sees and their own password. Password rules as for a
 * new password (NIST SP 800-63B §5.1.1.2: a length floor, no composition rules, a check against
 * known-breached passwords); the current password is asked for first and wrong guesses count
 * against the same per-address limit as sign-in (NIST SP 800-63B §5.2.2); after a change every
 * other session of the person ends (OWASP ASVS 4.0.3 V3.3.3), the one that made it stays.
 */
import { describe, expect, test } from 'vitest';
import { DEMO_PASSWORD, Visitor, demo, signedIn, sql } from '../helpers/http';

async function crewMember(email: string, name = 'Account Test') {
	const [person] = await sql(
		`INSERT INTO person (email, name, password_hash)
		 SELECT $1, $2, password_hash FROM person WHERE email = $3 RETURNING id`,
		[email, name, demo.host]
	);
	await sql(
		`INSERT INTO membership (channel_id, person_id, roles)
		 SELECT id, $1, '{camera}' FROM channel WHERE name = 'Torquehaven Garage'`,
		[person.id]
	);
	return person.id as string;
}

const nameOf = async (id: string) =>
	(await sql(`SELECT name FROM person WHERE id = $1`, [id]))[0].name as string;

const next = 'the jack stand goes under the pinch weld';

describe('Account: your name', () => {
	test('a person renames themselves; the page and the header show the new name', async () => {
		const id = await crewMember('account.rename@example.test', 'Old Name');
		const me = await signedIn('account.rename@example.test');
		const saved = await me.action('/account?/rename', { name: '  Rosa Quillfeather  ' });
		expect(saved.type).toBe('success');
		expect(saved.data.action).toBe('rename');
		expect(await nameOf(id)).toBe('Rosa Quillfeather');
		const page = await (await me.request('/account')).text();
		expect(page).toContain('Rosa Quillfeather');
	});

	test('an empty name or one with a control character is refused beside the field and nothing changes', async () => {
		const id = await crewMember('account.badname@example.test', 'Kept Name');
		const me = await signedIn('account.badname@example.test');
		const empty = await me.action('/account?/rename', { name: '   ' });
		expect(empty.status).toBe(400);
		expect(empty.data.action).toBe('rename');
		expect(empty.data.errors.name[0]).toMatch(/name/i);
		const control = await me.action('/account?/rename', { name: 'Kept\u0007Name' });
		expect(control.status).toBe(400);
		expect(control.data.errors.name[0]).toMatch(/control character/);
		expect(await nameOf(id)).toBe('Kept Name');
	});
});

describe('Account: your password', () => {
	test('a wrong current password, a short new one or a mismatch is refused beside its field', async () => {
		await crewMember('account.refused@example.test');
		const me = await signedIn('account.refused@example.test');
		const wrong = await me.action('/account?/password', {
			currentPassword: 'not the password at all',
			password: next,
			confirm: next
		});
		expect(wrong.status).toBe(400);
		expect(wrong.data.action).toBe('password');
		expect(wrong.data.errors.currentPassword[0]).toMatch(/current password/i);
		const short = await me.action('/account?/password', {
			currentPassword: DEMO_PASSWORD,
			password: 'short one',
			confirm: 'short one'
		});
		expect(short.status).toBe(400);
		expect(short.data.errors.password[0]).toMatch(/at least 15 characters/);
		const differ = await me.action('/account?/password', {
			currentPassword: DEMO_PASSWORD,
			password: next,
			confirm: `${next}!`
		});
		expect(differ.status).toBe(400);
		expect(differ.data.errors.confirm[0]).toMatch(/differ/);
		// Nothing changed: the old password still signs in.
		expect((await new Visitor().signIn('account.refused@example.test')).status).toBe(303);
	});

	test('a change keeps this session, ends the others, and only the new password signs in', async () => {
		const email = 'account.change@example.test';
		await crewMember(email);
		const me = await signedIn(email);
		const elsewhere = await signedIn(email);
		expect((await elsewhere.api('/api/me')).status).toBe(200);
		const changed = await me.action('/account?/password', {
			currentPassword: DEMO_PASSWORD,
			password: next,
			confirm: next
		});
		expect(changed.type).toBe('success');
		expect(changed.data.changed).toBe(true);
		expect((await me.api('/api/me')).status).toBe(200);
		expect((await elsewhere.api('/api/me')).status).toBe(401);
		expect((await new Visitor().signIn(email)).status).not.toBe(303);
		expect((await new Visitor().signIn(email, next)).status).toBe(303);
	});

	test('guessing the current password counts against the sign-in limit for the address', async () => {
		const email = 'account.guess@example.test';
		await crewMember(email);
		const me = await signedIn(email);
		// THROTTLE_LIMITS.signInAddress: 10 failures in 15 minutes.
		for (let guess = 0; guess < 10; guess++) {
			const answer = await me.action('/account?/password', {
				currentPassword: `guess number ${guess}`,
				password: next,
				confirm: next
			});
			expect(answer.status).toBe(400);
		}
		const refused = await me.action('/account?/password', {
			currentPassword: DEMO_PASSWORD,
			password: next,
			confirm: next
		});
		expect(refused.status).toBe(429);
		expect(refused.data.errors.currentPassword[0]).toMatch(/too many/i);
		// The right password was not even checked: the old one still signs in once the window ends.
		const [row] = await sql(`SELECT password_hash FROM person WHERE email = $1`, [email]);
		const [host] = await sql(`SELECT password_hash FROM person WHERE email = $1`, [demo.host]);
		expect(row.password_hash).toBe(host.password_hash);
	});
});
