/**
 * Stage locks over HTTP against the built server: once an episode is published, every write path
 * to its rundown, script, shot list, notes, chapters, spec and caution cards and cut answers 409
 * with the reason in words and changes nothing, through the API (a personal token) and through the
 * pages' form actions alike; a producer who moves it back opens the work again.
 *
 * Outside sources for the checks:
 * - 409 Conflict for a request that conflicts with the state of the target: RFC 9110 §15.5.10
 *   (tests/REFERENCES.md, "HTTP").
 * - What picture lock and publishing fix: tests/REFERENCES.md, "Production stages" (common practice,
 *   from memory).
 * - Access control on the server, deny by default: OWASP ASVS 4.0 V4 (tests/REFERENCES.md,
 *   "Web security").
 */
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let channelId: string;
let producer: Visitor;
let token: string;
let partSku: string;

/** The producer's personal API token, as an outside tool would call with it. */
const viaToken = (path: string, init: RequestInit & { json?: unknown } = {}) =>
	new Visitor().api(path, {
		...init,
		headers: { ...(init.headers as Record<string, string>), authorization: `Bearer ${token}` }
	});

interface World {
	episode: string;
	segment: string;
	spare: string;
	note: string;
	chapter: string;
	card: string;
}

let seq = 0;
/** A fresh episode in the edit stage with one of everything, made through the API as a producer. */
async function newWorld(): Promise<World> {
	const slug = `locks-${Date.now()}-${seq++}`;
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, $2, $3, 600, '29.97', 'edit', 17982) RETURNING id`,
		[channelId, `Lock test ${slug}`, slug]
	);
	const id: string = episode.id;
	const made = async (path: string, json: unknown, status = 201) => {
		const answer = await viaToken(path, { method: 'POST', json });
		expect(answer.status, `${path} ${JSON.stringify(answer.body)}`).toBe(status);
		return answer.body;
	};
	const segment = (
		await made(`/api/episodes/${id}/segments`, {
			kind: 'install-step',
			title: 'Bleed the brakes',
			plannedSeconds: 90,
			hazards: ['brakes']
		})
	).segment;
	const spare = (
		await made(`/api/episodes/${id}/segments`, { kind: 'tips', title: 'Tip', plannedSeconds: 20 })
	).segment;
	const script = await viaToken(`/api/segments/${segment.id}/script`, {
		method: 'PUT',
		json: { body: 'Crack the bleeder a quarter turn.', version: segment.script.version }
	});
	expect(script.status).toBe(200);
	await made(`/api/segments/${segment.id}/shots`, { what: 'Bleeder close-up' });
	const note = await made(`/api/episodes/${id}/notes`, {
		text: 'Bleeder wrench on screen',
		segmentId: segment.id
	});
	const chapter = await made(`/api/episodes/${id}/chapters`, { startFrame: 0, title: 'Cold open' });
	const card = await made(`/api/episodes/${id}/spec-cards`, {
		input: { kind: 'torque', value: 11, unit: 'N·m', fastener: 'Bleeder screw' },
		at: '1:00'
	});
	return {
		episode: id,
		segment: segment.id,
		spare: spare.id,
		note: (note.note ?? note).id,
		chapter: chapter.chapter.id,
		card: card.id
	};
}

/** Everything an episode's work is made of, as one comparable value. */
async function snapshot(episodeId: string) {
	const rows = async (text: string) => JSON.stringify(await sql(text, [episodeId]));
	return {
		episode: await rows(
			`SELECT stage, cut_duration_frames, script_status, script_approved_fingerprint FROM episode WHERE id = $1`
		),
		segments: await rows(
			`SELECT id, position, title, version, recorded_frames FROM segment WHERE episode_id = $1 ORDER BY id`
		),
		scripts: await rows(
			`SELECT s.segment_id, s.body, s.version FROM segment_script s JOIN segment g ON g.id = s.segment_id WHERE g.episode_id = $1 ORDER BY 1`
		),
		shots: await rows(
			`SELECT h.id, h.what, h.version FROM shot h JOIN segment g ON g.id = h.segment_id WHERE g.episode_id = $1 ORDER BY 1`
		),
		cautions: await rows(
			`SELECT c.id, c.text, c.at_frame, c.version FROM caution c JOIN segment g ON g.id = c.segment_id WHERE g.episode_id = $1 ORDER BY 1`
		),
		notes: await rows(
			`SELECT n.id, n.text, n.program_frame, n.version, (SELECT count(*) FROM segment_note_part p WHERE p.note_id = n.id) AS parts FROM segment_note n WHERE n.episode_id = $1 ORDER BY 1`
		),
		chapters: await rows(
			`SELECT id, start_frame, title, version FROM chapter WHERE episode_id = $1 ORDER BY 1`
		),
		cards: await rows(
			`SELECT id, input, at_frame, version FROM spec_card WHERE episode_id = $1 ORDER BY 1`
		),
		reviews: await rows(`SELECT kind FROM script_review WHERE episode_id = $1 ORDER BY 1`)
	};
}

/** The record's version now; "1" once it is gone (a removal earlier in the list took it). */
const version = async (table: string, id: string, column = 'id') =>
	String((await sql(`SELECT version FROM ${table} WHERE ${column} = $1`, [id]))[0]?.version ?? 1);

type Lockable = 'rundown' | 'script' | 'shots' | 'notes' | 'chapters' | 'cards' | 'cut';
interface WritePath {
	name: string;
	what: Lockable;
	/** The answer's status and the message a person reads (the API's error, a form's form error). */
	call: (world: World) => Promise<{ status: number; message: string }>;
}

const api =
	(
		method: string,
		path: (w: World) => string,
		json?: (w: World) => Promise<unknown> | unknown
	): WritePath['call'] =>
	async (world) => {
		const answer = await viaToken(path(world), {
			method,
			...(json ? { json: await json(world) } : {})
		});
		return { status: answer.status, message: answer.body?.error ?? '' };
	};

const form =
	(
		path: (w: World) => string,
		fields: (w: World) => Promise<Record<string, string | string[]>>
	): WritePath['call'] =>
	async (world) => {
		const answer = await producer.action(path(world), await fields(world));
		return { status: answer.status, message: answer.data?.errors?.form?.[0] ?? '' };
	};

const E = (w: World) => `/api/episodes/${w.episode}`;
const P = (w: World) => `/episodes/${w.episode}`;

const writePaths: WritePath[] = [
	// The API, with a personal token.
	{
		name: 'POST /api/episodes/[id]/segments',
		what: 'rundown',
		call: api(
			'POST',
			(w) => `${E(w)}/segments`,
			() => ({ kind: 'tips', title: 'Late tip', plannedSeconds: 20 })
		)
	},
	{
		name: 'PUT /api/episodes/[id]/segments/order',
		what: 'rundown',
		call: api(
			'PUT',
			(w) => `${E(w)}/segments/order`,
			async (w) => ({
				order: (
					await sql(`SELECT id FROM segment WHERE episode_id = $1 ORDER BY position DESC`, [
						w.episode
					])
				).map((row) => row.id)
			})
		)
	},
	{
		name: 'PATCH /api/segments/[id]',
		what: 'rundown',
		call: api(
			'PATCH',
			(w) => `/api/segments/${w.segment}`,
			async (w) => ({ title: 'Renamed', version: Number(await version('segment', w.segment)) })
		)
	},
	{
		name: 'PATCH /api/segments/[id] (length in the cut)',
		what: 'rundown',
		call: api(
			'PATCH',
			(w) => `/api/segments/${w.segment}`,
			async (w) => ({ recorded: '0:01:20', version: Number(await version('segment', w.segment)) })
		)
	},
	{
		name: 'DELETE /api/segments/[id]',
		what: 'rundown',
		call: api(
			'DELETE',
			(w) => `/api/segments/${w.spare}`,
			async (w) => ({ version: Number(await version('segment', w.spare)) })
		)
	},
	{
		name: 'PUT /api/segments/[id]/script',
		what: 'script',
		call: api(
			'PUT',
			(w) => `/api/segments/${w.segment}/script`,
			async (w) => ({
				body: 'Typed after publishing.',
				version: Number(await version('segment_script', w.segment, 'segment_id'))
			})
		)
	},
	{
		name: 'POST /api/episodes/[id]/script-review (submit)',
		what: 'script',
		call: api(
			'POST',
			(w) => `${E(w)}/script-review`,
			() => ({ action: 'submit', body: '' })
		)
	},
	{
		name: 'POST /api/segments/[id]/shots',
		what: 'shots',
		call: api(
			'POST',
			(w) => `/api/segments/${w.segment}/shots`,
			() => ({ what: 'Pickup shot' })
		)
	},
	{
		name: 'PATCH /api/segments/[id]/cautions/[hazard]',
		what: 'cards',
		call: api(
			'PATCH',
			(w) => `/api/segments/${w.segment}/cautions/brakes`,
			async (w) => ({
				text: 'New words.',
				version: Number(
					(
						await sql(`SELECT version FROM caution WHERE segment_id = $1 AND hazard = 'brakes'`, [
							w.segment
						])
					)[0].version
				)
			})
		)
	},
	{
		name: 'POST /api/episodes/[id]/notes',
		what: 'notes',
		call: api(
			'POST',
			(w) => `${E(w)}/notes`,
			(w) => ({ text: 'Late note', segmentId: w.segment })
		)
	},
	{
		name: 'PATCH /api/notes/[id]',
		what: 'notes',
		call: api(
			'PATCH',
			(w) => `/api/notes/${w.note}`,
			async (w) => ({ programTime: '0:40', version: Number(await version('segment_note', w.note)) })
		)
	},
	{
		name: 'DELETE /api/notes/[id]',
		what: 'notes',
		call: api('DELETE', (w) => `/api/notes/${w.note}`)
	},
	{
		name: 'POST /api/episodes/[id]/chapters',
		what: 'chapters',
		call: api(
			'POST',
			(w) => `${E(w)}/chapters`,
			() => ({ startFrame: 900, title: 'Late chapter' })
		)
	},
	{
		name: 'PATCH /api/episodes/[id]/chapters/[chapterId]',
		what: 'chapters',
		call: api(
			'PATCH',
			(w) => `${E(w)}/chapters/${w.chapter}`,
			async (w) => ({ title: 'Renamed', version: Number(await version('chapter', w.chapter)) })
		)
	},
	{
		name: 'DELETE /api/episodes/[id]/chapters/[chapterId]',
		what: 'chapters',
		call: api('DELETE', (w) => `${E(w)}/chapters/${w.chapter}`)
	},
	{
		name: 'PATCH /api/episodes/[id]/cut',
		what: 'cut',
		call: api(
			'PATCH',
			(w) => `${E(w)}/cut`,
			() => ({ duration: '00:12:30;00' })
		)
	},
	{
		name: 'POST /api/episodes/[id]/spec-cards',
		what: 'cards',
		call: api(
			'POST',
			(w) => `${E(w)}/spec-cards`,
			() => ({ input: { kind: 'torque', value: 95, unit: 'ft·lbf', fastener: 'Lug nuts' } })
		)
	},
	{
		name: 'PATCH /api/episodes/[id]/spec-cards/[cardId]',
		what: 'cards',
		call: api(
			'PATCH',
			(w) => `${E(w)}/spec-cards/${w.card}`,
			async (w) => ({ at: '2:00', version: Number(await version('spec_card', w.card)) })
		)
	},
	{
		name: 'DELETE /api/episodes/[id]/spec-cards/[cardId]',
		what: 'cards',
		call: api('DELETE', (w) => `${E(w)}/spec-cards/${w.card}`)
	},
	// The pages' form actions, as a signed-in producer (who may do every one of them).
	{
		name: 'action rundown?/add',
		what: 'rundown',
		call: form(
			(w) => `${P(w)}/rundown?/add`,
			async () => ({ kind: 'tips', title: 'Late tip', planned: '0:20' })
		)
	},
	{
		name: 'action rundown?/move',
		what: 'rundown',
		call: form(
			(w) => `${P(w)}/rundown?/move`,
			async (w) => ({ segmentId: w.segment, direction: 'down' })
		)
	},
	{
		name: 'action rundown?/move (past the end)',
		what: 'rundown',
		call: form(
			(w) => `${P(w)}/rundown?/move`,
			async (w) => ({ segmentId: w.segment, direction: 'up' })
		)
	},
	{
		name: 'action rundown/[segmentId]?/save',
		what: 'rundown',
		call: form(
			(w) => `${P(w)}/rundown/${w.segment}?/save`,
			async (w) => ({
				kind: 'install-step',
				title: 'Renamed',
				planned: '1:30',
				hazards: ['brakes'],
				needsFootage: 'on',
				version: await version('segment', w.segment)
			})
		)
	},
	{
		name: 'action rundown/[segmentId]?/recorded',
		what: 'rundown',
		call: form(
			(w) => `${P(w)}/rundown/${w.segment}?/recorded`,
			async (w) => ({ recorded: '1:20', version: await version('segment', w.segment) })
		)
	},
	{
		name: 'action rundown/[segmentId]?/caution',
		what: 'cards',
		call: form(
			(w) => `${P(w)}/rundown/${w.segment}?/caution`,
			async (w) => ({
				hazard: 'brakes',
				at: '0:44',
				version: String(
					(
						await sql(`SELECT version FROM caution WHERE segment_id = $1 AND hazard = 'brakes'`, [
							w.segment
						])
					)[0].version
				)
			})
		)
	},
	{
		name: 'action rundown/[segmentId]?/addShot',
		what: 'shots',
		call: form(
			(w) => `${P(w)}/rundown/${w.segment}?/addShot`,
			async () => ({ what: 'Pickup', roll: 'B' })
		)
	},
	{
		name: 'action rundown/[segmentId]?/delete',
		what: 'rundown',
		call: form(
			(w) => `${P(w)}/rundown/${w.spare}?/delete`,
			async (w) => ({ version: await version('segment', w.spare) })
		)
	},
	{
		name: 'action script?/review (submit)',
		what: 'script',
		call: form(
			(w) => `${P(w)}/script?/review`,
			async () => ({ action: 'submit', body: '' })
		)
	},
	{
		name: 'action script/[segmentId]?/save',
		what: 'script',
		call: form(
			(w) => `${P(w)}/script/${w.segment}?/save`,
			async (w) => ({
				body: 'Typed after publishing.',
				version: await version('segment_script', w.segment, 'segment_id')
			})
		)
	},
	{
		name: 'action shots?/addShot',
		what: 'shots',
		call: form(
			(w) => `${P(w)}/shots?/addShot`,
			async (w) => ({ segmentId: w.segment, what: 'Pickup', roll: 'B' })
		)
	},
	{
		name: 'action notes?/create',
		what: 'notes',
		call: form(
			(w) => `${P(w)}/notes?/create`,
			async (w) => ({ text: 'Late note', segmentId: w.segment })
		)
	},
	{
		name: 'action notes?/place',
		what: 'notes',
		call: form(
			(w) => `${P(w)}/notes?/place`,
			async (w) => ({
				noteId: w.note,
				version: await version('segment_note', w.note),
				programTime: '0:40'
			})
		)
	},
	{
		name: 'action notes?/write',
		what: 'notes',
		call: form(
			(w) => `${P(w)}/notes?/write`,
			async (w) => ({
				noteId: w.note,
				version: await version('segment_note', w.note),
				text: 'Rewritten'
			})
		)
	},
	{
		name: 'action notes?/link',
		what: 'notes',
		call: form(
			(w) => `${P(w)}/notes?/link`,
			async (w) => ({
				noteId: w.note,
				version: await version('segment_note', w.note),
				sku: partSku
			})
		)
	},
	{
		name: 'action notes?/remove',
		what: 'notes',
		call: form(
			(w) => `${P(w)}/notes?/remove`,
			async (w) => ({ noteId: w.note, version: await version('segment_note', w.note) })
		)
	},
	{
		name: 'action edit?/setCut',
		what: 'cut',
		call: form(
			(w) => `${P(w)}/edit?/setCut`,
			async () => ({ duration: '00:12:30;00' })
		)
	},
	{
		name: 'action edit?/addChapter',
		what: 'chapters',
		call: form(
			(w) => `${P(w)}/edit?/addChapter`,
			async () => ({ start: '0:30', title: 'Late chapter' })
		)
	},
	{
		name: 'action edit?/saveChapter',
		what: 'chapters',
		call: form(
			(w) => `${P(w)}/edit?/saveChapter`,
			async (w) => ({
				chapterId: w.chapter,
				version: await version('chapter', w.chapter),
				start: '0:00',
				title: 'Renamed'
			})
		)
	},
	{
		name: 'action edit?/removeChapter',
		what: 'chapters',
		call: form(
			(w) => `${P(w)}/edit?/removeChapter`,
			async (w) => ({ chapterId: w.chapter, version: await version('chapter', w.chapter) })
		)
	},
	{
		name: 'action spec-cards?/save',
		what: 'cards',
		call: form(
			(w) => `${P(w)}/spec-cards?/save`,
			async () => ({
				kind: 'tyre-change',
				from: '265/70R17',
				to: '285/70R17',
				segmentId: '',
				at: '3:00',
				durationSeconds: '40'
			})
		)
	},
	{
		name: 'action spec-cards?/remove',
		what: 'cards',
		call: form(
			(w) => `${P(w)}/spec-cards?/remove`,
			async (w) => ({ cardId: w.card, version: await version('spec_card', w.card) })
		)
	}
];

const reopensAt: Record<Lockable, string> = {
	rundown: 'Edit',
	script: 'Edit',
	shots: 'Edit',
	cut: 'Edit',
	notes: 'Locked',
	chapters: 'Locked',
	cards: 'Locked'
};

beforeAll(async () => {
	[{ id: channelId }] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	[{ sku: partSku }] = await sql(
		`SELECT sku FROM part WHERE channel_id = $1 ORDER BY sku LIMIT 1`,
		[channelId]
	);
	producer = await signedIn(demo.producer);
	const created = await producer.api('/api/tokens', {
		method: 'POST',
		json: { label: 'stage lock checks' }
	});
	expect(created.status).toBe(201);
	token = created.body.token.token;
});

describe('a published episode', () => {
	let world: World;
	let before: Awaited<ReturnType<typeof snapshot>>;

	beforeAll(async () => {
		world = await newWorld();
		await sql(`UPDATE episode SET stage = 'published' WHERE id = $1`, [world.episode]);
		before = await snapshot(world.episode);
	});

	test.each(writePaths)(
		'$name answers 409 with the reason and how to reopen it',
		async ({ call, what }) => {
			const { status, message } = await call(world);
			expect(status, message).toBe(409);
			expect(message).toMatch(/^This episode is published: /);
			expect(message).toContain(`A producer can move it back to ${reopensAt[what]} to change it.`);
		}
	);

	test('nothing the refused writes named changed in the database', async () => {
		expect(await snapshot(world.episode)).toEqual(before);
	});

	test('a comment on the script is still taken (it changes no work)', async () => {
		const answer = await viaToken(`${E(world)}/script-review`, {
			method: 'POST',
			json: { action: 'comment', body: 'Lovely episode.' }
		});
		expect(answer.status).toBe(200);
	});
});

describe('moving back opens the work again', () => {
	test('back to Locked: notes, chapters and cards open; rundown, script, shots and the cut stay fixed', async () => {
		const world = await newWorld();
		await sql(`UPDATE episode SET stage = 'published' WHERE id = $1`, [world.episode]);
		const moved = await viaToken(`${E(world)}/stage`, {
			method: 'POST',
			json: { from: 'published', to: 'locked', note: 'fix a chapter title' }
		});
		expect(moved.status, JSON.stringify(moved.body)).toBe(200);
		for (const path of writePaths) {
			// Deletions are left for last below, so the other paths still find their records.
			if (path.name.includes('DELETE') || path.name.includes('remove')) continue;
			const { status, message } = await path.call(world);
			if (reopensAt[path.what] === 'Locked')
				expect(status, `${path.name}: ${message}`).toBeLessThan(400);
			else {
				expect(status, path.name).toBe(409);
				expect(message, path.name).toMatch(/^The picture is locked/);
			}
		}
	});

	test('back to Edit: every write path works again', async () => {
		const world = await newWorld();
		await sql(`UPDATE episode SET stage = 'published' WHERE id = $1`, [world.episode]);
		const moved = await viaToken(`${E(world)}/stage`, {
			method: 'POST',
			json: { from: 'published', to: 'edit', note: 'one more pickup' }
		});
		expect(moved.status, JSON.stringify(moved.body)).toBe(200);
		const deletions = writePaths.filter(
			(path) => path.name.includes('DELETE') || path.name.includes('remove')
		);
		for (const path of [...writePaths.filter((p) => !deletions.includes(p)), ...deletions]) {
			const { status, message } = await path.call(world);
			// A second removal of the same record finds it gone: 404 is not a lock.
			if (status === 404) continue;
			expect(status, `${path.name}: ${message}`).toBeLessThan(400);
		}
	});
});
