/**
 * The role matrix: every API route and form action so far, called as each role and signed out,
 * answers 2xx, 401 or 403 as the access rules say (OWASP ASVS 4.0 V4: access control on the server,
 * deny by default). A member of one channel gets 404 for another channel's records.
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

let seq = 0;
const unique = (who: string) => `matrix-${who}-${Date.now()}-${seq++}@example.test`;
const ids: { host?: string; channelVersion?: () => Promise<number> } = {};

const apiCases: Case[] = [
	{ name: 'GET /api/me', allowed: everyone, call: async (v) => (await v.api('/api/me')).status },
	{
		name: 'GET /api/crew',
		allowed: everyone,
		call: async (v) => (await v.api('/api/crew')).status
	},
	{
		name: 'POST /api/crew',
		allowed: ['producer'],
		call: async (v, who) =>
			(
				await v.api('/api/crew', {
					method: 'POST',
					json: { email: unique(who), name: 'Matrix Hand', roles: ['host'] }
				})
			).status
	},
	{
		name: 'PATCH /api/crew/[personId]',
		allowed: ['producer'],
		call: async (v) =>
			(await v.api(`/api/crew/${ids.host}`, { method: 'PATCH', json: { roles: ['host'] } })).status
	},
	{
		name: 'GET /api/tokens',
		allowed: everyone,
		call: async (v) => (await v.api('/api/tokens')).status
	},
	{
		name: 'POST /api/tokens',
		allowed: everyone,
		call: async (v) =>
			(await v.api('/api/tokens', { method: 'POST', json: { label: 'matrix' } })).status
	},
	{
		name: 'DELETE /api/tokens/[id]',
		allowed: everyone,
		call: async (v, who) => {
			if (who === 'signed-out')
				return (
					await v.api('/api/tokens/00000000-0000-4000-8000-000000000000', { method: 'DELETE' })
				).status;
			const created = await v.api('/api/tokens', { method: 'POST', json: { label: 'to revoke' } });
			return (await v.api(`/api/tokens/${created.body.token.id}`, { method: 'DELETE' })).status;
		}
	},
	{
		name: 'GET /api/channel',
		allowed: everyone,
		call: async (v) => (await v.api('/api/channel')).status
	},
	{
		name: 'PATCH /api/channel',
		allowed: ['producer'],
		call: async (v) => {
			const [row] = await sql(`SELECT * FROM channel WHERE name = 'Torquehaven Garage'`);
			return (
				await v.api('/api/channel', {
					method: 'PATCH',
					json: {
						name: row.name,
						frameRate: row.frame_rate,
						callToAction: row.call_to_action,
						contact: row.contact,
						descriptionLimit: row.description_limit,
						version: row.version
					}
				})
			).status;
		}
	}
];

const actionCases: Case[] = [
	{
		name: 'action /crew?/invite',
		allowed: ['producer'],
		call: (v, who) =>
			actionStatus(v, '/crew?/invite', {
				email: unique(who),
				name: 'Matrix Form',
				roles: ['camera']
			})
	},
	{
		name: 'action /crew?/update',
		allowed: ['producer'],
		call: (v) =>
			actionStatus(v, '/crew?/update', {
				personId: ids.host!,
				'roles-present': '1',
				roles: ['host']
			})
	},
	{
		name: 'action /channel?/save',
		allowed: ['producer'],
		call: async (v) => {
			const [row] = await sql(`SELECT * FROM channel WHERE name = 'Torquehaven Garage'`);
			return actionStatus(v, '/channel?/save', {
				name: row.name,
				frameRate: row.frame_rate,
				callToAction: row.call_to_action,
				contact: row.contact,
				descriptionLimit: String(row.description_limit),
				version: String(row.version)
			});
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
	{
		name: 'action /account?/createToken',
		allowed: everyone,
		call: (v) => actionStatus(v, '/account?/createToken', { label: 'form token' })
	}
];

const pageCases: Case[] = [
	{ name: 'page /', allowed: everyone, call: async (v) => (await v.request('/')).status },
	{
		name: 'page /crew',
		allowed: ['producer'],
		call: async (v) => (await v.request('/crew', { headers: { accept: 'text/html' } })).status
	},
	{
		name: 'page /channel',
		allowed: ['producer'],
		call: async (v) => (await v.request('/channel', { headers: { accept: 'text/html' } })).status
	},
	{
		name: 'page /account',
		allowed: everyone,
		call: async (v) => (await v.request('/account')).status
	}
];

const visitors = new Map<Who, Visitor>();

beforeAll(async () => {
	for (const [who, visitor] of await visitorsByRole()) visitors.set(who, visitor);
	const [host] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.host]);
	ids.host = host.id;
});

describeRoleMatrix([...apiCases, ...actionCases, ...pageCases], visitors);

describe('channels see only their own records', () => {
	test('a producer of another channel gets 404 for this channel’s crew member, and changes nothing', async () => {
		const other = await signedIn(demo.otherProducer);
		const before = await sql(`SELECT roles FROM membership WHERE person_id = $1`, [ids.host]);
		const result = await other.api(`/api/crew/${ids.host}`, {
			method: 'PATCH',
			json: { roles: ['merch'] }
		});
		expect(result.status).toBe(404);
		expect(await sql(`SELECT roles FROM membership WHERE person_id = $1`, [ids.host])).toEqual(
			before
		);
	});

	test('the crew list of one channel never shows the other channel’s people', async () => {
		const other = await signedIn(demo.otherProducer);
		const crew = (await other.api('/api/crew')).body.items.map((m: { email: string }) => m.email);
		expect(crew).toContain(demo.editor);
		expect(crew).not.toContain(demo.host);
	});

	test('someone else’s token cannot be revoked: 404', async () => {
		const editor = await signedIn(demo.editor);
		const created = await editor.api('/api/tokens', { method: 'POST', json: { label: 'mine' } });
		const other = await signedIn(demo.otherProducer);
		expect(
			(await other.api(`/api/tokens/${created.body.token.id}`, { method: 'DELETE' })).status
		).toBe(404);
	});

	test('the shared editor switches channel and then works in the other channel only', async () => {
		const editor = await signedIn(demo.editor);
		const me = await editor.api('/api/me');
		expect(me.body.channels).toHaveLength(2);
		const target = me.body.channels.find((c: { name: string }) => c.name === 'Dune Wagon Weekly');
		expect(
			(await editor.request('/channel?/switch', { method: 'POST', form: { channelId: target.id } }))
				.status
		).toBe(303);
		const after = await editor.api('/api/me');
		expect(after.body.channel.name).toBe('Dune Wagon Weekly');
		const crew = (await editor.api('/api/crew')).body.items.map((m: { email: string }) => m.email);
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

/*
 * The edit (chapters, the cut's length, the edit page): every crew member reads; the editor and
 * the producer change. Cases run on an episode of their own so the demo episodes stay as seeded.
 */
const editIds: { episode?: string } = {};
const editPath = () => `/api/episodes/${editIds.episode}`;
const firstChapter = async () =>
	(
		await sql(
			`SELECT id, version FROM chapter WHERE episode_id = $1 ORDER BY start_frame LIMIT 1`,
			[editIds.episode]
		)
	)[0];
const spareChapter = async () =>
	(
		await sql(
			`INSERT INTO chapter (episode_id, start_frame, title) VALUES ($1, $2, 'Spare') RETURNING id, version`,
			[editIds.episode, 40000 + seq++ * 400]
		)
	)[0];

const editCases: Case[] = [
	{
		name: 'GET /api/episodes/[id]/chapters',
		allowed: everyone,
		call: async (v) => (await v.api(`${editPath()}/chapters`)).status
	},
	{
		name: 'GET /api/episodes/[id]/chapters?format=txt',
		allowed: everyone,
		call: async (v) => (await v.request(`${editPath()}/chapters?format=txt`)).status
	},
	{
		name: 'POST /api/episodes/[id]/chapters',
		allowed: ['producer', 'editor'],
		call: async (v) =>
			(
				await v.api(`${editPath()}/chapters`, {
					method: 'POST',
					json: { startFrame: 20000 + seq++ * 400, title: 'Matrix chapter' }
				})
			).status
	},
	{
		name: 'PATCH /api/episodes/[id]/chapters/[chapterId]',
		allowed: ['producer', 'editor'],
		call: async (v) => {
			const chapter = await firstChapter();
			return (
				await v.api(`${editPath()}/chapters/${chapter.id}`, {
					method: 'PATCH',
					json: { version: chapter.version, title: 'Cold open' }
				})
			).status;
		}
	},
	{
		name: 'DELETE /api/episodes/[id]/chapters/[chapterId]',
		allowed: ['producer', 'editor'],
		call: async (v) =>
			(await v.api(`${editPath()}/chapters/${(await spareChapter()).id}`, { method: 'DELETE' }))
				.status
	},
	{
		name: 'PATCH /api/episodes/[id]/cut',
		allowed: ['producer', 'editor'],
		call: async (v) =>
			(await v.api(`${editPath()}/cut`, { method: 'PATCH', json: { duration: '00:40:00;00' } }))
				.status
	}
];

const editActionCases: Case[] = [
	{
		name: 'action /episodes/[id]/edit?/setCut',
		allowed: ['producer', 'editor'],
		call: (v) =>
			actionStatus(v, `/episodes/${editIds.episode}/edit?/setCut`, { duration: '00:40:00;00' })
	},
	{
		name: 'action /episodes/[id]/edit?/addChapter',
		allowed: ['producer', 'editor'],
		call: (v) =>
			actionStatus(v, `/episodes/${editIds.episode}/edit?/addChapter`, {
				start: `${20 + (seq++ % 9)}:00`,
				title: 'Form chapter'
			})
	},
	{
		name: 'action /episodes/[id]/edit?/saveChapter',
		allowed: ['producer', 'editor'],
		call: async (v) => {
			const chapter = await firstChapter();
			return actionStatus(v, `/episodes/${editIds.episode}/edit?/saveChapter`, {
				chapterId: chapter.id,
				version: String(chapter.version),
				start: '00:00:00;00',
				title: 'Cold open'
			});
		}
	},
	{
		name: 'action /episodes/[id]/edit?/removeChapter',
		allowed: ['producer', 'editor'],
		call: async (v) => {
			const chapter = await spareChapter();
			return actionStatus(v, `/episodes/${editIds.episode}/edit?/removeChapter`, {
				chapterId: chapter.id,
				version: String(chapter.version)
			});
		}
	}
];

const editPageCases: Case[] = [
	{
		name: 'page /episodes/[id]/edit',
		allowed: everyone,
		call: async (v) =>
			(await v.request(`/episodes/${editIds.episode}/edit`, { headers: { accept: 'text/html' } }))
				.status
	}
];

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	// The shared editor lands in the other channel first (channels sort by name); work in Torquehaven.
	await visitors
		.get('editor')!
		.request('/channel?/switch', { method: 'POST', form: { channelId: channel.id } });
	// 00:40:00;00 at 29.97 drop-frame = 71928 frames (SMPTE ST 12-1: 4 × 17982).
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames) VALUES ($1, 'Matrix edit', $2, 600, '29.97', 'edit', 71928) RETURNING id`,
		[channel.id, `matrix-edit-${Date.now()}`]
	);
	editIds.episode = episode.id;
	await sql(
		`INSERT INTO chapter (episode_id, start_frame, title) VALUES ($1, 0, 'Cold open'), ($1, 3000, 'Lift'), ($1, 6000, 'Lower')`,
		[episode.id]
	);
});

describeRoleMatrix([...editCases, ...editActionCases, ...editPageCases], visitors);

describe('the edit of one channel is not found from another', () => {
	test('a producer of another channel gets 404 for this channel’s chapters, cut and edit page', async () => {
		const other = await signedIn(demo.otherProducer);
		const chapter = await firstChapter();
		expect((await other.api(`${editPath()}/chapters`)).status).toBe(404);
		expect(
			(
				await other.api(`${editPath()}/chapters/${chapter.id}`, {
					method: 'PATCH',
					json: { version: chapter.version, title: 'Theirs' }
				})
			).status
		).toBe(404);
		expect(
			(await other.api(`${editPath()}/cut`, { method: 'PATCH', json: { duration: '1:00' } })).status
		).toBe(404);
		expect((await other.request(`/episodes/${editIds.episode}/edit`)).status).toBe(404);
		expect((await firstChapter()).version).toBe(chapter.version);
	});
});

/*
 * Spec cards (list, export, create, change, delete, the spec-cards page and its actions): every crew
 * member reads; the editor and the producer write. Cases run on an episode of their own.
 */
const cardIds: { episode?: string; card?: string } = {};
const cardsPath = () => `/api/episodes/${cardIds.episode}/spec-cards`;
const matrixTorque = { kind: 'torque', value: 95, unit: 'ft·lbf', fastener: 'Matrix nuts' };
const cardVersion = async () =>
	(await sql(`SELECT version FROM spec_card WHERE id = $1`, [cardIds.card]))[0].version as number;
const spareCard = async () =>
	(
		await sql(
			`INSERT INTO spec_card (episode_id, kind, input, position) VALUES ($1, 'torque', $2, $3) RETURNING id, version`,
			[cardIds.episode, JSON.stringify(matrixTorque), 100 + seq++]
		)
	)[0];

const specCardCases: Case[] = [
	{
		name: 'GET /api/episodes/[id]/spec-cards',
		allowed: everyone,
		call: async (v) => (await v.api(cardsPath())).status
	},
	{
		name: 'GET /api/episodes/[id]/spec-cards?format=csv',
		allowed: everyone,
		call: async (v) => (await v.request(`${cardsPath()}?format=csv`)).status
	},
	{
		name: 'POST /api/episodes/[id]/spec-cards',
		allowed: ['producer', 'editor'],
		call: async (v) =>
			(await v.api(cardsPath(), { method: 'POST', json: { input: matrixTorque, at: '1:00' } }))
				.status
	},
	{
		name: 'PATCH /api/episodes/[id]/spec-cards/[cardId]',
		allowed: ['producer', 'editor'],
		call: async (v) =>
			(
				await v.api(`${cardsPath()}/${cardIds.card}`, {
					method: 'PATCH',
					json: { version: await cardVersion(), at: '2:00' }
				})
			).status
	},
	{
		name: 'DELETE /api/episodes/[id]/spec-cards/[cardId]',
		allowed: ['producer', 'editor'],
		call: async (v) =>
			(await v.api(`${cardsPath()}/${(await spareCard()).id}`, { method: 'DELETE' })).status
	}
];

const specCardActionCases: Case[] = [
	{
		name: 'action /episodes/[id]/spec-cards?/save',
		allowed: ['producer', 'editor'],
		call: (v) =>
			actionStatus(v, `/episodes/${cardIds.episode}/spec-cards?/save`, {
				kind: 'tyre-change',
				from: '265/70R17',
				to: '285/70R17',
				segmentId: '',
				at: '3:00',
				durationSeconds: '40'
			})
	},
	{
		name: 'action /episodes/[id]/spec-cards?/remove',
		allowed: ['producer', 'editor'],
		call: async (v) => {
			const card = await spareCard();
			return actionStatus(v, `/episodes/${cardIds.episode}/spec-cards?/remove`, {
				cardId: card.id,
				version: String(card.version)
			});
		}
	}
];

const specCardPageCases: Case[] = [
	{
		name: 'page /episodes/[id]/spec-cards',
		allowed: everyone,
		call: async (v) =>
			(
				await v.request(`/episodes/${cardIds.episode}/spec-cards`, {
					headers: { accept: 'text/html' }
				})
			).status
	}
];

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	// 00:13:40;00 at 29.97 drop-frame = 24576 frames (SMPTE ST 12-1: 820 × 30 − 2 × (13 − 1)).
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames) VALUES ($1, 'Matrix spec cards', $2, 600, '29.97', 'edit', 24576) RETURNING id`,
		[channel.id, `matrix-spec-cards-${Date.now()}`]
	);
	cardIds.episode = episode.id;
	cardIds.card = (await spareCard()).id;
});

describeRoleMatrix([...specCardCases, ...specCardActionCases, ...specCardPageCases], visitors);

describe('the spec cards of one channel are not found from another', () => {
	test('a producer of another channel gets 404 for this channel’s cards, their export and the page', async () => {
		const other = await signedIn(demo.otherProducer);
		const version = await cardVersion();
		expect((await other.api(cardsPath())).status).toBe(404);
		expect((await other.api(`${cardsPath()}?format=json`)).status).toBe(404);
		expect(
			(
				await other.api(`${cardsPath()}/${cardIds.card}`, {
					method: 'PATCH',
					json: { version, at: '4:00' }
				})
			).status
		).toBe(404);
		expect((await other.api(`${cardsPath()}/${cardIds.card}`, { method: 'DELETE' })).status).toBe(
			404
		);
		expect((await other.request(`/episodes/${cardIds.episode}/spec-cards`)).status).toBe(404);
		expect(await cardVersion()).toBe(version);
	});
});

/*
 * Featured parts (the catalogue, its import and export, segment notes, the featured parts list,
 * the publish kit, clicks, and their pages and actions). Everyone reads; the merch team changes
 * the catalogue, starts notes and links parts to them; the camera operator writes notes; the
 * editor places their program time; the producer may do all. Cases run on an episode and parts of their own.
 */
const partsIds: { episode?: string; segment?: string; note?: string; part?: string } = {};
const partsPath = () => `/api/episodes/${partsIds.episode}`;
const notePath = () => `/api/notes/${partsIds.note}`;
const noteVersion = async () =>
	(await sql(`SELECT version FROM segment_note WHERE id = $1`, [partsIds.note]))[0]
		.version as number;
const partVersion = async () =>
	(await sql(`SELECT version FROM part WHERE id = $1`, [partsIds.part]))[0].version as number;
const sparePart = async () =>
	(
		await sql(
			`INSERT INTO part (channel_id, sku, name, category, brand, price_cents, store_url) SELECT id, $1, 'Matrix spare', 'Test', 'Test', 100, 'https://shop.test/m' FROM channel WHERE name = 'Torquehaven Garage' RETURNING id, version`,
			[`MATRIX-SPARE-${Date.now()}-${seq++}`]
		)
	)[0];
const spareNote = async () =>
	(
		await sql(
			`INSERT INTO segment_note (episode_id, text) VALUES ($1, 'Matrix spare note') RETURNING id, version`,
			[partsIds.episode]
		)
	)[0];
const newPart = (who: string) => ({
	sku: `MATRIX-${who}-${Date.now()}-${seq++}`,
	name: 'Matrix part',
	category: 'Test',
	brand: 'Test',
	price: '1.00',
	storeUrl: 'https://shop.test/matrix'
});

const partsCases: Case[] = [
	{
		name: 'GET /api/parts',
		allowed: everyone,
		call: async (v) => (await v.api('/api/parts?q=kbs&pageSize=5')).status
	},
	{
		name: 'POST /api/parts',
		allowed: ['producer', 'merch'],
		call: async (v, who) =>
			(await v.api('/api/parts', { method: 'POST', json: newPart(who) })).status
	},
	{
		name: 'GET /api/parts/[id]',
		allowed: everyone,
		call: async (v) => (await v.api(`/api/parts/${partsIds.part}`)).status
	},
	{
		name: 'PATCH /api/parts/[id]',
		allowed: ['producer', 'merch'],
		call: async (v) =>
			(
				await v.api(`/api/parts/${partsIds.part}`, {
					method: 'PATCH',
					json: { version: await partVersion(), price: '2.00' }
				})
			).status
	},
	{
		name: 'DELETE /api/parts/[id]',
		allowed: ['producer', 'merch'],
		call: async (v) =>
			(await v.api(`/api/parts/${(await sparePart()).id}`, { method: 'DELETE' })).status
	},
	{
		name: 'POST /api/parts/import',
		allowed: ['producer', 'merch'],
		call: async (v) =>
			(
				await v.api('/api/parts/import', {
					method: 'POST',
					json: { action: 'preview', mode: 'update', csv: 'sku,price\r\nKBS-LB-300,99.00\r\n' }
				})
			).status
	},
	{
		name: 'GET /api/parts/export',
		allowed: everyone,
		call: async (v) => (await v.request('/api/parts/export')).status
	},
	{
		name: 'GET /api/episodes/[id]/notes',
		allowed: everyone,
		call: async (v) => (await v.api(`${partsPath()}/notes`)).status
	},
	{
		name: 'POST /api/episodes/[id]/notes',
		allowed: ['producer', 'camera', 'merch'],
		call: async (v) =>
			(
				await v.api(`${partsPath()}/notes`, {
					method: 'POST',
					json: { text: 'Matrix note', segmentId: partsIds.segment }
				})
			).status
	},
	{
		name: 'PATCH /api/notes/[id] (text)',
		allowed: ['producer', 'camera'],
		call: async (v) =>
			(
				await v.api(notePath(), {
					method: 'PATCH',
					json: { version: await noteVersion(), text: 'Matrix text' }
				})
			).status
	},
	{
		name: 'PATCH /api/notes/[id] (program time)',
		allowed: ['producer', 'editor'],
		call: async (v) =>
			(
				await v.api(notePath(), {
					method: 'PATCH',
					json: { version: await noteVersion(), programTime: '0:30' }
				})
			).status
	},
	{
		name: 'PATCH /api/notes/[id] (parts)',
		allowed: ['producer', 'merch'],
		call: async (v) =>
			(
				await v.api(notePath(), {
					method: 'PATCH',
					json: { version: await noteVersion(), partIds: [partsIds.part] }
				})
			).status
	},
	{
		name: 'DELETE /api/notes/[id]',
		allowed: ['producer', 'camera'],
		call: async (v) =>
			(await v.api(`/api/notes/${(await spareNote()).id}`, { method: 'DELETE' })).status
	},
	{
		name: 'GET /api/episodes/[id]/featured-parts',
		allowed: everyone,
		call: async (v) => (await v.api(`${partsPath()}/featured-parts`)).status
	},
	{
		name: 'GET /api/episodes/[id]/publish-kit?format=md',
		allowed: everyone,
		call: async (v) => (await v.request(`${partsPath()}/publish-kit?format=md`)).status
	},
	{
		name: 'GET /api/episodes/[id]/clicks',
		allowed: everyone,
		call: async (v) => (await v.api(`${partsPath()}/clicks`)).status
	}
];

const partsActionCases: Case[] = [
	{
		name: 'action /parts/new',
		allowed: ['producer', 'merch'],
		call: (v, who) => actionStatus(v, '/parts/new', newPart(who))
	},
	{
		name: 'action /parts/[id]?/save',
		allowed: ['producer', 'merch'],
		call: async (v) =>
			actionStatus(v, `/parts/${partsIds.part}?/save`, {
				...newPart('save'),
				sku: 'MATRIX-SAVED',
				version: String(await partVersion())
			})
	},
	{
		name: 'action /episodes/[id]/notes?/create',
		allowed: ['producer', 'camera', 'merch'],
		call: (v) =>
			actionStatus(v, `/episodes/${partsIds.episode}/notes?/create`, {
				text: 'Form note',
				segmentId: partsIds.segment!
			})
	},
	{
		name: 'action /episodes/[id]/notes?/write',
		allowed: ['producer', 'camera'],
		call: async (v) =>
			actionStatus(v, `/episodes/${partsIds.episode}/notes?/write`, {
				noteId: partsIds.note!,
				version: String(await noteVersion()),
				text: 'Form text'
			})
	},
	{
		name: 'action /episodes/[id]/notes?/place',
		allowed: ['producer', 'editor'],
		call: async (v) =>
			actionStatus(v, `/episodes/${partsIds.episode}/notes?/place`, {
				noteId: partsIds.note!,
				version: String(await noteVersion()),
				programTime: '0:40'
			})
	},
	{
		name: 'action /episodes/[id]/notes?/link',
		allowed: ['producer', 'merch'],
		call: async (v) =>
			actionStatus(v, `/episodes/${partsIds.episode}/notes?/link`, {
				noteId: partsIds.note!,
				version: String(await noteVersion()),
				sku: 'KBS-LB-300'
			})
	},
	{
		name: 'action /episodes/[id]/notes?/remove',
		allowed: ['producer', 'camera'],
		call: async (v) => {
			const note = await spareNote();
			return actionStatus(v, `/episodes/${partsIds.episode}/notes?/remove`, {
				noteId: note.id,
				version: String(note.version)
			});
		}
	}
];

const html = { headers: { accept: 'text/html' } };
const partsPageCases: Case[] = [
	{
		name: 'page /parts',
		allowed: everyone,
		call: async (v) => (await v.request('/parts?q=coil', html)).status
	},
	{
		name: 'page /parts/[id]',
		allowed: everyone,
		call: async (v) => (await v.request(`/parts/${partsIds.part}`, html)).status
	},
	{
		name: 'page /parts/new',
		allowed: ['producer', 'merch'],
		call: async (v) => (await v.request('/parts/new', html)).status
	},
	{
		name: 'page /parts/import',
		allowed: ['producer', 'merch'],
		call: async (v) => (await v.request('/parts/import', html)).status
	},
	{
		name: 'page /episodes/[id]/notes',
		allowed: everyone,
		call: async (v) => (await v.request(`/episodes/${partsIds.episode}/notes`, html)).status
	},
	{
		name: 'page /episodes/[id]/parts',
		allowed: everyone,
		call: async (v) => (await v.request(`/episodes/${partsIds.episode}/parts`, html)).status
	},
	{
		name: 'page /episodes/[id]/publish',
		allowed: everyone,
		call: async (v) => (await v.request(`/episodes/${partsIds.episode}/publish`, html)).status
	}
];

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames) VALUES ($1, 'Matrix parts', $2, 600, '29.97', 'edit', 24576) RETURNING id`,
		[channel.id, `matrix-parts-${Date.now()}`]
	);
	partsIds.episode = episode.id;
	partsIds.segment = (
		await sql(
			`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, 1, 'install-step', 'Matrix step') RETURNING id`,
			[episode.id]
		)
	)[0].id;
	partsIds.note = (await spareNote()).id;
	partsIds.part = (await sparePart()).id;
});

describeRoleMatrix([...partsCases, ...partsActionCases, ...partsPageCases], visitors);

describe('featured parts of one channel are not found from another; tracked links are public', () => {
	test('a producer of another channel gets 404 for this channel’s parts, notes, kit and clicks, and changes nothing', async () => {
		const other = await signedIn(demo.otherProducer);
		const [partBefore, noteBefore] = [await partVersion(), await noteVersion()];
		expect((await other.api(`/api/parts/${partsIds.part}`)).status).toBe(404);
		expect(
			(
				await other.api(`/api/parts/${partsIds.part}`, {
					method: 'PATCH',
					json: { version: partBefore, price: '9.00' }
				})
			).status
		).toBe(404);
		expect((await other.api(`/api/parts/${partsIds.part}`, { method: 'DELETE' })).status).toBe(404);
		expect((await other.api(`${partsPath()}/notes`)).status).toBe(404);
		expect(
			(
				await other.api(notePath(), {
					method: 'PATCH',
					json: { version: noteBefore, text: 'Theirs' }
				})
			).status
		).toBe(404);
		expect((await other.api(`${partsPath()}/featured-parts`)).status).toBe(404);
		expect((await other.api(`${partsPath()}/publish-kit`)).status).toBe(404);
		expect((await other.api(`${partsPath()}/clicks`)).status).toBe(404);
		expect((await other.request(`/parts/${partsIds.part}`)).status).toBe(404);
		expect((await other.request(`/episodes/${partsIds.episode}/notes`)).status).toBe(404);
		expect((await other.api('/api/parts?q=IBS')).body.total).toBe(0);
		expect([await partVersion(), await noteVersion()]).toEqual([partBefore, noteBefore]);
	});

	test('a tracked link answers anyone, signed in or not (302), and needs no session', async () => {
		const [link] = await sql(
			`SELECT l.code FROM tracked_link l JOIN episode e ON e.id = l.episode_id WHERE e.slug = 'tallboy-coil-spacers' LIMIT 1`
		);
		expect((await new Visitor().request(`/go/${link.code}`)).status).toBe(302);
		expect((await visitors.get('host')!.request(`/go/${link.code}`)).status).toBe(302);
	});
});
