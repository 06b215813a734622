/**
 * Bad input gets a clear 4xx in plain words and leaves the database unchanged
 * (OWASP ASVS 4.0 V5 input validation; JSON errors are `{ error, issues? }`).
 */
import { describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

const count = async (table: string) =>
	Number((await sql(`SELECT count(*)::int AS n FROM ${table}`))[0].n);

describe('bad input', () => {
	test('malformed JSON answers 400 and creates nobody', async () => {
		const producer = await signedIn(demo.producer);
		const before = await count('person');
		const result = await producer.api('/api/crew', {
			method: 'POST',
			body: '{"email": "half',
			headers: { 'content-type': 'application/json' }
		});
		expect(result.status).toBe(400);
		expect(result.body.error).toMatch(/not valid JSON/);
		expect(await count('person')).toBe(before);
	});

	test('missing fields and wrong types answer 400 with an issue per field', async () => {
		const producer = await signedIn(demo.producer);
		const before = await count('membership');
		const result = await producer.api('/api/crew', {
			method: 'POST',
			json: { email: 42, roles: ['driver'] }
		});
		expect(result.status).toBe(400);
		expect(Object.keys(result.body.issues).sort()).toEqual(['email', 'name', 'roles.0']);
		expect(result.body.issues.name[0]).toMatch(/Enter a name/);
		expect(await count('membership')).toBe(before);
	});

	test('over-long strings are refused with the limit in words', async () => {
		const producer = await signedIn(demo.producer);
		const result = await producer.api('/api/crew', {
			method: 'POST',
			json: { email: 'long.name@example.test', name: 'x'.repeat(500), roles: ['host'] }
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.name[0]).toMatch(/under 80 characters/);
		expect(await sql(`SELECT 1 FROM person WHERE email = 'long.name@example.test'`)).toHaveLength(
			0
		);
	});

	test('a crew update with unknown fields is refused (strict shape)', async () => {
		const producer = await signedIn(demo.producer);
		const [host] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.host]);
		const result = await producer.api(`/api/crew/${host.id}`, {
			method: 'PATCH',
			json: { roles: ['host'], isAdmin: true }
		});
		expect(result.status).toBe(400);
	});

	test('a non-uuid id in the path is a 404, not a server error', async () => {
		const producer = await signedIn(demo.producer);
		const result = await producer.api('/api/crew/../../etc', {
			method: 'PATCH',
			json: { roles: ['host'] }
		});
		expect([400, 404]).toContain(result.status);
		const result2 = await producer.api('/api/crew/not-a-uuid', {
			method: 'PATCH',
			json: { roles: ['host'] }
		});
		expect(result2.status).toBe(404);
	});

	test('a revoked or made-up token is a 401 with a plain message', async () => {
		const result = await new Visitor().api('/api/me', {
			headers: { authorization: 'Bearer wr_made_up_token' }
		});
		expect(result.status).toBe(401);
		expect(result.body.error).toMatch(/unknown or revoked/);
	});

	test('a stale channel-settings version answers 409 with the saved version, and the newer save stays', async () => {
		const producer = await signedIn(demo.producer);
		const { body } = await producer.api('/api/channel');
		const base = { ...body.channel };
		delete base.id;
		const first = await producer.api('/api/channel', {
			method: 'PATCH',
			json: { ...base, contact: 'first save wins' }
		});
		expect(first.status).toBe(200);
		const stale = await producer.api('/api/channel', {
			method: 'PATCH',
			json: { ...base, contact: 'stale save' }
		});
		expect(stale.status).toBe(409);
		expect(stale.body.current.contact).toBe('first save wins');
		expect((await producer.api('/api/channel')).body.channel.contact).toBe('first save wins');
	});

	test('a form with bad values keeps what the person typed', async () => {
		const producer = await signedIn(demo.producer);
		const result = await producer.action('/crew?/invite', {
			email: 'not-an-address',
			name: 'Kept Name',
			roles: []
		});
		expect(result.status).toBe(400);
		expect(result.data.values.name).toBe('Kept Name');
		expect(result.data.errors.email[0]).toMatch(/e-mail address/);
		expect(result.data.errors.roles[0]).toMatch(/at least one role/);
	});
});
