/**
 * The role matrix: every API route and form action so far, called as each role and signed out,
 * answers 2xx, 401 or 403 as the access rules say (OWASP ASVS 4.0 V4: access control on the server,
 * deny by default). A member of one channel gets 404 for another channel's records.
 */
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

type Who = 'producer' | 'host' | 'camera' | 'editor' | 'merch' | 'signed-out';
const everyone: Who[] = ['producer', 'host', 'camera', 'editor', 'merch'];

interface Case {
	name: string;
	allowed: Who[];
	call: (visitor: Visitor, who: Who) => Promise<number>;
}

let seq = 0;
const unique = (who: string) => `matrix-${who}-${Date.now()}-${seq++}@example.test`;
const ids: { host?: string; channelVersion?: () => Promise<number> } = {};

const apiCases: Case[] = [
	{ name: 'GET /api/me', allowed: everyone, call: async (v) => (await v.api('/api/me')).status },
	{ name: 'GET /api/crew', allowed: everyone, call: async (v) => (await v.api('/api/crew')).status },
	{ name: 'POST /api/crew', allowed: ['producer'], call: async (v, who) => (await v.api('/api/crew', { method: 'POST', json: { email: unique(who), name: 'Matrix Hand', roles: ['host'] } })).status },
	{ name: 'PATCH /api/crew/[personId]', allowed: ['producer'], call: async (v) => (await v.api(`/api/crew/${ids.host}`, { method: 'PATCH', json: { roles: ['host'] } })).status },
	{ name: 'GET /api/tokens', allowed: everyone, call: async (v) => (await v.api('/api/tokens')).status },
	{ name: 'POST /api/tokens', allowed: everyone, call: async (v) => (await v.api('/api/tokens', { method: 'POST', json: { label: 'matrix' } })).status },
	{
		name: 'DELETE /api/tokens/[id]',
		allowed: everyone,
		call: async (v, who) => {
			if (who === 'signed-out') return (await v.api('/api/tokens/00000000-0000-4000-8000-000000000000', { method: 'DELETE' })).status;
			const created = await v.api('/api/tokens', { method: 'POST', json: { label: 'to revoke' } });
			return (await v.api(`/api/tokens/${created.body.token.id}`, { method: 'DELETE' })).status;
		}
	},
	{ name: 'GET /api/channel', allowed: everyone, call: async (v) => (await v.api('/api/channel')).status },
	{
		name: 'PATCH /api/channel',
		allowed: ['producer'],
		call: async (v) => {
			const [row] = await sql(`SELECT * FROM channel WHERE name = 'Torquehaven Garage'`);
			return (
				await v.api('/api/channel', {
					method: 'PATCH',
					json: { name: row.name, frameRate: row.frame_rate, callToAction: row.call_to_action, contact: row.contact, descriptionLimit: row.description_limit, version: row.version }
				})
			).status;
		}
	}
];

const actionStatus = async (v: Visitor, path: string, form: Record<string, string | string[]>) => {
	const response = await v.request(path, { method: 'POST', form, headers: { accept: 'application/json', 'x-sveltekit-action': 'true' } });
	if (response.status !== 200) return response.status; // 401 from the guard
	const result = await response.json();
	return result.type === 'redirect' ? 303 : result.status;
};

const actionCases: Case[] = [
	{ name: 'action /crew?/invite', allowed: ['producer'], call: (v, who) => actionStatus(v, '/crew?/invite', { email: unique(who), name: 'Matrix Form', roles: ['camera'] }) },
	{ name: 'action /crew?/update', allowed: ['producer'], call: (v) => actionStatus(v, '/crew?/update', { personId: ids.host!, 'roles-present': '1', roles: ['host'] }) },
	{
		name: 'action /channel?/save',
		allowed: ['producer'],
		call: async (v) => {
			const [row] = await sql(`SELECT * FROM channel WHERE name = 'Torquehaven Garage'`);
			return actionStatus(v, '/channel?/save', { name: row.name, frameRate: row.frame_rate, callToAction: row.call_to_action, contact: row.contact, descriptionLimit: String(row.description_limit), version: String(row.version) });
		}
	},
	{
		name: 'action /channel?/switch',
		allowed: everyone,
		call: async (v) => {
			const [row] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
			return actionStatus(v, '/channel?/switch', { channelId: row.id });
		}
	},
	{ name: 'action /account?/createToken', allowed: everyone, call: (v) => actionStatus(v, '/account?/createToken', { label: 'form token' }) }
];

const pageCases: Case[] = [
	{ name: 'page /', allowed: everyone, call: async (v) => (await v.request('/')).status },
	{ name: 'page /crew', allowed: ['producer'], call: async (v) => (await v.request('/crew', { headers: { accept: 'text/html' } })).status },
	{ name: 'page /channel', allowed: ['producer'], call: async (v) => (await v.request('/channel', { headers: { accept: 'text/html' } })).status },
	{ name: 'page /account', allowed: everyone, call: async (v) => (await v.request('/account')).status }
];

const visitors = new Map<Who, Visitor>();

beforeAll(async () => {
	for (const role of everyone) visitors.set(role, await signedIn(demo[role as keyof typeof demo]));
	visitors.set('signed-out', new Visitor());
	const [host] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.host]);
	ids.host = host.id;
});

describe.each([...apiCases, ...actionCases, ...pageCases])('$name', (routeCase) => {
	test.each([...everyone, 'signed-out' as const])('as %s', async (who) => {
		const status = await routeCase.call(visitors.get(who)!, who);
		const isPage = routeCase.name.startsWith('page');
		if (who === 'signed-out') expect(status).toBe(isPage ? 303 : 401);
		else if (routeCase.allowed.includes(who)) expect(status).toBeGreaterThanOrEqual(200), expect(status).toBeLessThan(400);
		else expect(status).toBe(403);
	});
});

describe('channels see only their own records', () => {
	test('a producer of another channel gets 404 for this channel’s crew member, and changes nothing', async () => {
		const other = await signedIn(demo.otherProducer);
		const before = await sql(`SELECT roles FROM membership WHERE person_id = $1`, [ids.host]);
		const result = await other.api(`/api/crew/${ids.host}`, { method: 'PATCH', json: { roles: ['merch'] } });
		expect(result.status).toBe(404);
		expect(await sql(`SELECT roles FROM membership WHERE person_id = $1`, [ids.host])).toEqual(before);
	});

	test('the crew list of one channel never shows the other channel’s people', async () => {
		const other = await signedIn(demo.otherProducer);
		const crew = (await other.api('/api/crew')).body.crew.map((m: { email: string }) => m.email);
		expect(crew).toContain(demo.editor);
		expect(crew).not.toContain(demo.host);
	});

	test('someone else’s token cannot be revoked: 404', async () => {
		const editor = await signedIn(demo.editor);
		const created = await editor.api('/api/tokens', { method: 'POST', json: { label: 'mine' } });
		const other = await signedIn(demo.otherProducer);
		expect((await other.api(`/api/tokens/${created.body.token.id}`, { method: 'DELETE' })).status).toBe(404);
	});

	test('the shared editor switches channel and then works in the other channel only', async () => {
		const editor = await signedIn(demo.editor);
		const me = await editor.api('/api/me');
		expect(me.body.channels).toHaveLength(2);
		const target = me.body.channels.find((c: { name: string }) => c.name === 'Dune Wagon Weekly');
		expect((await editor.request('/channel?/switch', { method: 'POST', form: { channelId: target.id } })).status).toBe(303);
		const after = await editor.api('/api/me');
		expect(after.body.channel.name).toBe('Dune Wagon Weekly');
		const crew = (await editor.api('/api/crew')).body.crew.map((m: { email: string }) => m.email);
		expect(crew).not.toContain(demo.host);
	});

	test('switching to a channel one is not on is refused', async () => {
		const host = await signedIn(demo.host);
		const [other] = await sql(`SELECT id FROM channel WHERE name = 'Dune Wagon Weekly'`);
		const result = await host.action('/channel?/switch', { channelId: other.id });
		expect(result.status).toBe(404);
		expect((await host.api('/api/me')).body.channel.name).toBe('Torquehaven Garage');
	});
});
