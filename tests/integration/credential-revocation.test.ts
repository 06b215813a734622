/**
 * After a password reset nothing issued under the old password keeps working: sessions end, the
 * person's personal API tokens are revoked, and older reset links are void (a new link replaces
 * them). Disabling a crew member revokes their tokens for that channel, so enabling them again
 * does not bring old tokens back. OWASP ASVS 4.0.3 V3.3.3 (terminate sessions after a password
 * change) and V2.5.4-style single active recovery secret; the tokens follow the same rule.
 */
import { describe, expect, test } from 'vitest';
import { DEMO_PASSWORD, Visitor, demo, linkIn, mailTo, signedIn, sql } from '../helpers/http';

async function crewMember(email: string) {
	const [person] = await sql(
		`INSERT INTO person (email, name, password_hash)
		 SELECT $1, 'Revocation Test', password_hash FROM person WHERE email = $2 RETURNING id`,
		[email, demo.host]
	);
	await sql(
		`INSERT INTO membership (channel_id, person_id, roles)
		 SELECT id, $1, '{host}' FROM channel WHERE name = 'Torquehaven Garage'`,
		[person.id]
	);
	return person.id as string;
}

async function tokenFor(visitor: Visitor) {
	const created = await visitor.api('/api/tokens', {
		method: 'POST',
		json: { label: 'edit laptop' }
	});
	expect(created.status).toBe(201);
	return created.body.token as { id: string; token: string };
}

const asToken = (secret: string) =>
	new Visitor().api('/api/me', { headers: { authorization: `Bearer ${secret}` } });

/** Asks for a reset link from a client of its own and returns the new link's path. */
async function resetLink(email: string, from: string, earlier: string[] = []) {
	const started = Date.now() - 1000;
	const asked = await new Visitor(from).action('/reset', { email });
	expect(asked.data.sent).toBe(true);
	const deadline = Date.now() + 15_000;
	while (Date.now() < deadline) {
		const path = new URL(linkIn((await mailTo(email, { after: started })).text)).pathname;
		if (!earlier.includes(path)) return path;
		await new Promise((resolve) => setTimeout(resolve, 200));
	}
	throw new Error(`no second reset mail to ${email}`);
}

const newPassword = 'a fresh gasket on the thermostat housing';

describe('a password reset', () => {
	test('revokes every API token of the person, along with their sessions', async () => {
		const email = 'reset.tokens@example.test';
		await crewMember(email);
		const session = await signedIn(email);
		const token = await tokenFor(session);
		expect((await asToken(token.token)).status).toBe(200);

		const link = await resetLink(email, '127.0.13.1');
		const done = await new Visitor().action(link, { password: newPassword, confirm: newPassword });
		expect(done.type).toBe('redirect');

		expect((await session.api('/api/me')).status).toBe(401);
		const afterwards = await asToken(token.token);
		expect(afterwards.status).toBe(401);
		expect(afterwards.body.error).toMatch(/revoked/);
		const [row] = await sql(`SELECT revoked_at FROM api_token WHERE id = $1`, [token.id]);
		expect(row.revoked_at).not.toBeNull();
	});

	test('a newer reset link voids the older ones', async () => {
		const email = 'reset.twice@example.test';
		await crewMember(email);
		const first = await resetLink(email, '127.0.13.2');
		const second = await resetLink(email, '127.0.13.3', [first]);
		expect(second).not.toBe(first);

		const stale = await new Visitor().request(first);
		expect(await stale.text()).toMatch(/This reset link has expired/);
		const refused = await new Visitor().action(first, {
			password: newPassword,
			confirm: newPassword
		});
		expect(refused.status).toBe(404);
		expect((await new Visitor().signIn(email, DEMO_PASSWORD)).status).toBe(303);

		const done = await new Visitor().action(second, {
			password: newPassword,
			confirm: newPassword
		});
		expect(done.type).toBe('redirect');
		expect((await new Visitor().signIn(email, newPassword)).status).toBe(303);
	});
});

describe('disabling a crew member', () => {
	test("revokes their API tokens for the channel: enabling them again doesn't bring the tokens back", async () => {
		const email = 'disable.tokens@example.test';
		const personId = await crewMember(email);
		const token = await tokenFor(await signedIn(email));
		expect((await asToken(token.token)).status).toBe(200);

		const producer = await signedIn(demo.producer);
		const disable = (disabled: boolean) =>
			producer.api(`/api/crew/${personId}`, { method: 'PATCH', json: { disabled } });
		expect((await disable(true)).status).toBe(200);
		expect((await asToken(token.token)).status).toBe(401);

		expect((await disable(false)).status).toBe(200);
		expect((await asToken(token.token)).status).toBe(401);
		const [row] = await sql(`SELECT revoked_at FROM api_token WHERE id = $1`, [token.id]);
		expect(row.revoked_at).not.toBeNull();
		// The person can sign in again and make a new token.
		const fresh = await tokenFor(await signedIn(email));
		expect((await asToken(fresh.token)).status).toBe(200);
	});
});
