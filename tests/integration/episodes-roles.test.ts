/**
 * The role matrix for episode work: every API route, form action and page of episodes, rundown,
 * scripts, cautions, shots, builds and follow-ups, called as each role and signed out, answers
 * 2xx, 401, 403 as the rules say (OWASP ASVS 4.0 V4: access control on the server, deny by
 * default). A member of the other demo channel gets 404 for this channel's records (V4.2: no
 * insecure direct object references). The calls run on an episode and build made for the matrix,
 * so the demo records stay as seeded.
 *
 * The rules (src/lib/stages.ts, src/lib/server/episodes/segments.ts and cautions.ts): everyone
 * reads; a producer changes an episode's details and moves it back; the host and producer plan the
 * rundown and write; the camera operator and producer add shots; the editor and producer place
 * cautions and set lengths in the cut; the host and producer word cautions; the host and producer
 * edit builds.
 */
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import {
	actionStatus,
	describeRoleMatrix,
	everyone,
	visitorsByRole,
	type Case,
	type Who
} from '../helpers/role-matrix';

const ids = { episode: '', segment: '', build: '', cautionHazard: 'brakes' };
let seq = 0;
const episodeVersion = async () =>
	(await sql(`SELECT version FROM episode WHERE id = $1`, [ids.episode]))[0].version as number;
const segmentVersion = async () =>
	(await sql(`SELECT version FROM segment WHERE id = $1`, [ids.segment]))[0].version as number;
const scriptVersion = async () =>
	(await sql(`SELECT version FROM segment_script WHERE segment_id = $1`, [ids.segment]))[0]
		.version as number;
const cautionVersion = async () =>
	(
		await sql(`SELECT version FROM caution WHERE segment_id = $1 AND hazard = 'brakes'`, [
			ids.segment
		])
	)[0].version as number;
const segmentOrder = async () =>
	(await sql(`SELECT id FROM segment WHERE episode_id = $1 ORDER BY position`, [ids.episode])).map(
		(row) => row.id as string
	);
/** A segment of its own for a call that deletes one. */
const spareSegment = async () => {
	const [row] = await sql(
		`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, (SELECT coalesce(max(position), 0) + 1 FROM segment WHERE episode_id = $1), 'tips', 'Spare') RETURNING id, version`,
		[ids.episode]
	);
	await sql(`INSERT INTO segment_script (segment_id) VALUES ($1)`, [row.id]);
	return row as { id: string; version: number };
};
/** Back moves need the episode at shoot first; the matrix puts it there before each call. */
const atShoot = async () => sql(`UPDATE episode SET stage = 'shoot' WHERE id = $1`, [ids.episode]);
const buildForm = async () => {
	const [row] = await sql(`SELECT * FROM build WHERE id = $1`, [ids.build]);
	return {
		name: row.name,
		year: String(row.year),
		vehicleType: row.vehicle_type,
		drivetrain: row.drivetrain,
		frontSuspension: row.front_suspension,
		rearSuspension: row.rear_suspension,
		frontSpring: 'coil',
		rearSpring: 'leaf',
		frontLiftIn: '0',
		rearLiftIn: '2',
		rearLiftMethod: 'lift-block',
		tyreSize: row.tyre_size,
		notes: '',
		version: String(row.version)
	};
};

const api =
	(
		path: () => string,
		init: (
			who: Who
		) => Promise<RequestInit & { json?: unknown }> | (RequestInit & { json?: unknown }) = () => ({})
	) =>
	async (v: Visitor, who: Who) =>
		(await v.api(path(), await init(who))).status;

const E = () => `/api/episodes/${ids.episode}`;
const S = () => `/api/segments/${ids.segment}`;

const apiCases: Case[] = [
	{ name: 'GET /api/episodes', allowed: everyone, call: api(() => '/api/episodes') },
	{
		name: 'POST /api/episodes',
		allowed: ['producer'],
		call: api(
			() => '/api/episodes',
			(who) => ({
				method: 'POST',
				json: { title: `Matrix ${who} ${seq++}`, targetRuntimeSeconds: 600, frameRate: '25' }
			})
		)
	},
	{ name: 'GET /api/episodes/[id]', allowed: everyone, call: api(E) },
	{
		name: 'PATCH /api/episodes/[id]',
		allowed: ['producer'],
		call: api(E, async () => ({
			method: 'PATCH',
			json: { logline: `Matrix ${seq++}`, version: await episodeVersion() }
		}))
	},
	{ name: 'GET /api/episodes/[id]/stage', allowed: everyone, call: api(() => `${E()}/stage`) },
	{
		name: 'POST /api/episodes/[id]/stage (back)',
		allowed: ['producer'],
		call: async (v) => {
			await atShoot();
			return (
				await v.api(`${E()}/stage`, {
					method: 'POST',
					json: { from: 'shoot', to: 'script', note: 'matrix' }
				})
			).status;
		}
	},
	{
		name: 'GET /api/episodes/[id]/segments',
		allowed: everyone,
		call: api(() => `${E()}/segments`)
	},
	{
		name: 'POST /api/episodes/[id]/segments',
		allowed: ['producer', 'host'],
		call: api(
			() => `${E()}/segments`,
			() => ({
				method: 'POST',
				json: { kind: 'tips', title: `Matrix tip ${seq++}`, plannedSeconds: 20 }
			})
		)
	},
	{
		name: 'PUT /api/episodes/[id]/segments/order',
		allowed: ['producer', 'host'],
		call: api(
			() => `${E()}/segments/order`,
			async () => ({ method: 'PUT', json: { order: (await segmentOrder()).reverse() } })
		)
	},
	{
		name: 'POST /api/episodes/[id]/script-preview',
		allowed: everyone,
		call: api(
			() => `${E()}/script-preview`,
			() => ({ method: 'POST', json: { markdown: '**Preview** me' } })
		)
	},
	{
		name: 'GET /api/episodes/[id]/script-review',
		allowed: everyone,
		call: api(() => `${E()}/script-review`)
	},
	{
		name: 'POST /api/episodes/[id]/script-review (comment)',
		allowed: ['producer', 'host'],
		call: api(
			() => `${E()}/script-review`,
			() => ({ method: 'POST', json: { action: 'comment', body: 'Matrix comment' } })
		)
	},
	{ name: 'GET /api/segments/[id]', allowed: everyone, call: api(S) },
	{
		name: 'PATCH /api/segments/[id] (plan)',
		allowed: ['producer', 'host'],
		call: api(S, async () => ({
			method: 'PATCH',
			json: { title: `Bleed the brakes ${seq++}`, version: await segmentVersion() }
		}))
	},
	{
		name: 'PATCH /api/segments/[id] (length in the cut)',
		allowed: ['producer', 'editor'],
		call: api(S, async () => ({
			method: 'PATCH',
			json: { recorded: '00:01:10:00', version: await segmentVersion() }
		}))
	},
	{
		name: 'DELETE /api/segments/[id]',
		allowed: ['producer', 'host'],
		call: async (v) => {
			const spare = await spareSegment();
			return (
				await v.api(`/api/segments/${spare.id}`, {
					method: 'DELETE',
					json: { version: spare.version }
				})
			).status;
		}
	},
	{ name: 'GET /api/segments/[id]/script', allowed: everyone, call: api(() => `${S()}/script`) },
	{
		name: 'PUT /api/segments/[id]/script',
		allowed: ['producer', 'host'],
		call: api(
			() => `${S()}/script`,
			async (who) => ({
				method: 'PUT',
				json: { body: `Written by ${who}.`, version: await scriptVersion() }
			})
		)
	},
	{
		name: 'PATCH /api/segments/[id]/cautions/[hazard] (words)',
		allowed: ['producer', 'host'],
		call: api(
			() => `${S()}/cautions/brakes`,
			async () => ({
				method: 'PATCH',
				json: { text: `Have brake work inspected ${seq++}.`, version: await cautionVersion() }
			})
		)
	},
	{
		name: 'PATCH /api/segments/[id]/cautions/[hazard] (placement)',
		allowed: ['producer', 'editor'],
		call: api(
			() => `${S()}/cautions/brakes`,
			async () => ({ method: 'PATCH', json: { at: '0:42', version: await cautionVersion() } })
		)
	},
	{ name: 'GET /api/segments/[id]/shots', allowed: everyone, call: api(() => `${S()}/shots`) },
	{
		name: 'POST /api/segments/[id]/shots',
		allowed: ['producer', 'camera'],
		call: api(
			() => `${S()}/shots`,
			() => ({ method: 'POST', json: { what: `Matrix shot ${seq++}` } })
		)
	}
];

const P = () => `/episodes/${ids.episode}`;
const R = () => `/episodes/${ids.episode}/rundown/${ids.segment}`;

const actionCases: Case[] = [
	{
		name: 'action /episodes/new?/create',
		allowed: ['producer'],
		call: (v, who) =>
			actionStatus(v, '/episodes/new?/create', {
				title: `Form matrix ${who} ${seq++}`,
				targetRuntime: '8:00',
				frameRate: '25'
			})
	},
	{
		name: 'action /episodes/[id]?/save',
		allowed: ['producer'],
		call: async (v) =>
			actionStatus(v, `${P()}?/save`, {
				title: 'Matrix episode',
				targetRuntime: '10:00',
				frameRate: '29.97',
				logline: `Form ${seq++}`,
				version: String(await episodeVersion())
			})
	},
	{
		name: 'action /episodes/[id]?/move (back)',
		allowed: ['producer'],
		call: async (v) => {
			await atShoot();
			return actionStatus(v, `${P()}?/move`, { from: 'shoot', to: 'script', note: 'matrix' });
		}
	},
	{
		name: 'action /episodes/[id]/rundown?/add',
		allowed: ['producer', 'host'],
		call: (v) =>
			actionStatus(v, `${P()}/rundown?/add`, {
				kind: 'tips',
				title: `Form tip ${seq++}`,
				planned: '0:20'
			})
	},
	{
		name: 'action /episodes/[id]/rundown?/move',
		allowed: ['producer', 'host'],
		call: (v) =>
			actionStatus(v, `${P()}/rundown?/move`, { segmentId: ids.segment, direction: 'down' })
	},
	{
		name: 'action /episodes/[id]/rundown/[segmentId]?/save',
		allowed: ['producer', 'host'],
		call: async (v) =>
			actionStatus(v, `${R()}?/save`, {
				kind: 'install-step',
				title: 'Bleed the brakes',
				planned: '1:30',
				hazards: ['brakes'],
				needsFootage: 'on',
				version: String(await segmentVersion())
			})
	},
	{
		name: 'action /episodes/[id]/rundown/[segmentId]?/recorded',
		allowed: ['producer', 'editor'],
		call: async (v) =>
			actionStatus(v, `${R()}?/recorded`, {
				recorded: '1:20',
				version: String(await segmentVersion())
			})
	},
	{
		name: 'action /episodes/[id]/rundown/[segmentId]?/caution (words)',
		allowed: ['producer', 'host'],
		call: async (v) =>
			actionStatus(v, `${R()}?/caution`, {
				hazard: 'brakes',
				text: `Inspect it ${seq++}.`,
				version: String(await cautionVersion())
			})
	},
	{
		name: 'action /episodes/[id]/rundown/[segmentId]?/caution (placement)',
		allowed: ['producer', 'editor'],
		call: async (v) =>
			actionStatus(v, `${R()}?/caution`, {
				hazard: 'brakes',
				at: '0:44',
				version: String(await cautionVersion())
			})
	},
	{
		name: 'action /episodes/[id]/rundown/[segmentId]?/addShot',
		allowed: ['producer', 'camera'],
		call: (v) => actionStatus(v, `${R()}?/addShot`, { what: `Form shot ${seq++}`, roll: 'B' })
	},
	{
		name: 'action /episodes/[id]/rundown/[segmentId]?/delete',
		allowed: ['producer', 'host'],
		call: async (v) => {
			const spare = await spareSegment();
			return actionStatus(v, `/episodes/${ids.episode}/rundown/${spare.id}?/delete`, {
				version: String(spare.version)
			});
		}
	},
	{
		name: 'action /episodes/[id]/script?/review (comment)',
		allowed: ['producer', 'host'],
		call: (v) =>
			actionStatus(v, `${P()}/script?/review`, { action: 'comment', body: 'Form comment' })
	},
	{
		name: 'action /episodes/[id]/script/[segmentId]?/save',
		allowed: ['producer', 'host'],
		call: async (v, who) =>
			actionStatus(v, `${P()}/script/${ids.segment}?/save`, {
				body: `Form text by ${who}.`,
				version: String(await scriptVersion())
			})
	},
	{
		name: 'action /builds/new?/create',
		allowed: ['producer', 'host'],
		call: async (v, who) => {
			const { version: _version, ...fields } = await buildForm();
			return actionStatus(v, '/builds/new?/create', {
				...fields,
				name: `Matrix build ${who} ${seq++}`
			});
		}
	},
	{
		name: 'action /builds/[id]?/save',
		allowed: ['producer', 'host'],
		call: async (v) => actionStatus(v, `/builds/${ids.build}?/save`, await buildForm())
	}
];

const page = (path: () => string) => async (v: Visitor) =>
	(await v.request(path(), { headers: { accept: 'text/html' } })).status;
const pageCases: Case[] = [
	{ name: 'page /episodes', allowed: everyone, call: page(() => '/episodes') },
	{ name: 'page /episodes/new', allowed: ['producer'], call: page(() => '/episodes/new') },
	{ name: 'page /episodes/[id]', allowed: everyone, call: page(P) },
	{ name: 'page /episodes/[id]/rundown', allowed: everyone, call: page(() => `${P()}/rundown`) },
	{ name: 'page /episodes/[id]/rundown/[segmentId]', allowed: everyone, call: page(R) },
	{ name: 'page /episodes/[id]/script', allowed: everyone, call: page(() => `${P()}/script`) },
	{
		name: 'page /episodes/[id]/script/[segmentId]',
		allowed: everyone,
		call: page(() => `${P()}/script/${ids.segment}`)
	},
	{ name: 'page /builds', allowed: everyone, call: page(() => '/builds') },
	{ name: 'page /builds/new', allowed: ['producer', 'host'], call: page(() => '/builds/new') },
	{ name: 'page /builds/[id]', allowed: everyone, call: page(() => `/builds/${ids.build}`) },
	{ name: 'page /follow-ups', allowed: everyone, call: page(() => '/follow-ups') }
];

const visitors = new Map<Who, Visitor>();

beforeAll(async () => {
	for (const [who, visitor] of await visitorsByRole()) visitors.set(who, visitor);
	// The shared editor lands in the other channel first (channels sort by name); this matrix is Torquehaven's.
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	await visitors
		.get('editor')!
		.request('/channel?/switch', { method: 'POST', form: { channelId: channel.id } });
	const producer = visitors.get('producer')!;
	const [mikaRow] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.camera]);
	const created = await producer.api('/api/episodes', {
		method: 'POST',
		json: {
			title: 'Matrix episode',
			targetRuntimeSeconds: '10:00',
			frameRate: '29.97',
			assignments: { camera: mikaRow.id }
		}
	});
	ids.episode = created.body.episode.id;
	const segment = await producer.api(`/api/episodes/${ids.episode}/segments`, {
		method: 'POST',
		json: {
			kind: 'install-step',
			title: 'Bleed the brakes',
			plannedSeconds: 90,
			hazards: ['brakes']
		}
	});
	ids.segment = segment.body.segment.id;
	const [build] = await sql(
		`INSERT INTO build (channel_id, name, year, vehicle_type, drivetrain, front_suspension, rear_suspension, tyre_size) VALUES ($1, 'Matrix rig', 2001, 'Compact pickup', 'RWD', 'Independent, coil', 'Leaf-sprung solid axle', '265/70R17') RETURNING id`,
		[channel.id]
	);
	ids.build = build.id;
});

describeRoleMatrix([...apiCases, ...actionCases, ...pageCases], visitors);

describe('another channel sees none of these records', () => {
	let other: Visitor;
	beforeAll(async () => {
		other = await signedIn(demo.otherProducer);
	});

	test.each([
		['GET /api/episodes/[id]', () => other.api(E())],
		[
			'PATCH /api/episodes/[id]',
			async () =>
				other.api(E(), {
					method: 'PATCH',
					json: { logline: 'taken over', version: await episodeVersion() }
				})
		],
		[
			'POST /api/episodes/[id]/stage',
			() => other.api(`${E()}/stage`, { method: 'POST', json: { from: 'script', to: 'shoot' } })
		],
		['GET /api/episodes/[id]/segments', () => other.api(`${E()}/segments`)],
		[
			'POST /api/episodes/[id]/segments',
			() =>
				other.api(`${E()}/segments`, {
					method: 'POST',
					json: { kind: 'tips', title: 'Sneaky', plannedSeconds: 1 }
				})
		],
		[
			'PUT /api/episodes/[id]/segments/order',
			async () =>
				other.api(`${E()}/segments/order`, { method: 'PUT', json: { order: await segmentOrder() } })
		],
		[
			'POST /api/episodes/[id]/script-preview',
			() => other.api(`${E()}/script-preview`, { method: 'POST', json: { markdown: 'x' } })
		],
		[
			'POST /api/episodes/[id]/script-review',
			() =>
				other.api(`${E()}/script-review`, {
					method: 'POST',
					json: { action: 'comment', body: 'x' }
				})
		],
		[
			'PATCH /api/segments/[id]',
			async () =>
				other.api(S(), {
					method: 'PATCH',
					json: { title: 'taken over', version: await segmentVersion() }
				})
		],
		[
			'PUT /api/segments/[id]/script',
			async () =>
				other.api(`${S()}/script`, {
					method: 'PUT',
					json: { body: 'taken over', version: await scriptVersion() }
				})
		],
		[
			'PATCH /api/segments/[id]/cautions/[hazard]',
			async () =>
				other.api(`${S()}/cautions/brakes`, {
					method: 'PATCH',
					json: { text: 'taken over', version: await cautionVersion() }
				})
		],
		[
			'POST /api/segments/[id]/shots',
			() => other.api(`${S()}/shots`, { method: 'POST', json: { what: 'taken over' } })
		],
		[
			'page /episodes/[id]',
			async () => ({
				status: (await other.request(P(), { headers: { accept: 'text/html' } })).status
			})
		],
		[
			'page /builds/[id]',
			async () => ({
				status: (await other.request(`/builds/${ids.build}`, { headers: { accept: 'text/html' } }))
					.status
			})
		]
	] as const)('%s answers 404 and changes nothing', async (_name, call) => {
		const before = await sql(
			`SELECT (SELECT row_to_json(e) FROM episode e WHERE e.id = $1) AS episode, (SELECT json_agg(s ORDER BY position) FROM segment s WHERE s.episode_id = $1) AS segments, (SELECT body FROM segment_script WHERE segment_id = $2) AS script`,
			[ids.episode, ids.segment]
		);
		expect((await call()).status).toBe(404);
		const after = await sql(
			`SELECT (SELECT row_to_json(e) FROM episode e WHERE e.id = $1) AS episode, (SELECT json_agg(s ORDER BY position) FROM segment s WHERE s.episode_id = $1) AS segments, (SELECT body FROM segment_script WHERE segment_id = $2) AS script`,
			[ids.episode, ids.segment]
		);
		expect(after).toEqual(before);
	});

	test('the other channel’s episode list and follow-ups never show this channel’s episodes', async () => {
		const titles = (await other.api('/api/episodes')).body.items.map(
			(e: { title: string }) => e.title
		);
		expect(titles).toContain('Sandpiper brake refresh');
		expect(titles).not.toContain('Matrix episode');
		const followUps = await other.request('/follow-ups', { headers: { accept: 'text/html' } });
		expect(await followUps.text()).not.toContain('Tallboy front axle regear');
	});
});
