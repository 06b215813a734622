/**
 * The notes page's take picker fetches on demand: `GET /api/episodes/<id>/takes/picker` answers a
 * few takes of one episode whose clip name or shot holds the typed words, in shot-list order;
 * without JavaScript a typed clip name is resolved on the server; and the notes page no longer
 * ships every take of the episode.
 *
 * Outside source for the order: one unpaged SQL query over the same rows, PostgreSQL sorting them
 * itself (`tests/REFERENCES.md`, "Database and text": the test cluster's C.UTF-8 collation sorts
 * clip names by code point); the matching is checked by filtering that reference list with
 * JavaScript's own `toLowerCase` and `includes`, not with our SQL.
 *
 * The rows live in a channel of this file's own, so the demo channel stays as seeded.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, ownChannel, signedIn, sql } from '../helpers/http';

const EMAIL = 'takes.producer@take-picker.test';
const SEGMENTS = 3;
const SHOTS_PER_SEGMENT = 3;
const TAKES_PER_SHOT = 12;
const SHOT_WORDS = ['Wheel off, hub in view', 'Torque the lug nuts', 'Brake caliper close-up'];
let channelId = '';
let episodeId = '';
let segmentIds: string[] = [];
let producer: Visitor;

interface ReferenceTake {
	id: string;
	clipName: string;
	shot: string;
	segmentId: string;
}
let reference: ReferenceTake[] = [];

beforeAll(async () => {
	({ channelId, episodeId } = await ownChannel({
		channelName: 'Zz picker bay',
		email: EMAIL,
		personName: 'Aa Picker Producer',
		role: 'producer',
		passwordOf: demo.producer,
		episode: { title: 'Picker bay test episode', slug: 'picker-bay-test', stage: 'shoot' }
	}));
	segmentIds = (
		await sql<{ id: string }>(
			`INSERT INTO segment (episode_id, position, kind, title)
			 SELECT $1, i, 'install-step', 'Picker step ' || i FROM generate_series(1, ${SEGMENTS}) AS i
			 RETURNING id`,
			[episodeId]
		)
	).map((row) => row.id);
	// Shots written in reverse position order, so insertion order is not the answer's order.
	await sql(
		`INSERT INTO shot (segment_id, what, position)
		 SELECT segment.id, ($2::text[])[1 + (segment.position + p) % 3], p
		 FROM segment, generate_series(${SHOTS_PER_SEGMENT}, 1, -1) AS p WHERE segment.episode_id = $1`,
		[episodeId, SHOT_WORDS]
	);
	// 108 takes: clip names repeat in every shot (ties broken by id), mixed case, and one per shot
	// with a LIKE wildcard in it; source in and out one second apart at 30 frames a second.
	await sql(
		`INSERT INTO take (shot_id, clip_name, source_in_frames, source_out_frames, good)
		 SELECT shot.id,
		   CASE WHEN t = 1 THEN 'PKR_100%' WHEN t % 2 = 0 THEN 'pkr_' || lpad((t % 5)::text, 4, '0')
		        ELSE 'PKR_' || lpad((t % 5)::text, 4, '0') END,
		   t * 30, t * 30 + 30, t % 3 = 0
		 FROM shot JOIN segment ON segment.id = shot.segment_id,
		   generate_series(1, ${TAKES_PER_SHOT}) AS t
		 WHERE segment.episode_id = $1`,
		[episodeId]
	);
	// One clip name of its own in each segment, and one shared by the first two segments.
	for (const [index, segmentId] of segmentIds.entries()) {
		const [shot] = await sql<{ id: string }>(
			`SELECT id FROM shot WHERE segment_id = $1 ORDER BY position LIMIT 1`,
			[segmentId]
		);
		await sql(
			`INSERT INTO take (shot_id, clip_name, source_in_frames, source_out_frames)
			 VALUES ($1, $2, 9000, 9300)`,
			[shot.id, `ONLY_SEG_${index + 1}`]
		);
		if (index < 2)
			await sql(
				`INSERT INTO take (shot_id, clip_name, source_in_frames, source_out_frames)
				 VALUES ($1, 'TWIN_0001', 9000, 9300)`,
				[shot.id]
			);
	}
	reference = await sql<ReferenceTake>(
		`SELECT take.id, take.clip_name AS "clipName", shot.what AS shot, shot.segment_id AS "segmentId"
		 FROM take JOIN shot ON shot.id = take.shot_id JOIN segment ON segment.id = shot.segment_id
		 WHERE segment.episode_id = $1
		 ORDER BY segment.position, shot.position, take.clip_name, take.id`,
		[episodeId]
	);
	producer = await signedIn(EMAIL);
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM membership WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM person WHERE email LIKE '%@take-picker.test'`);
	await sql(`DELETE FROM channel WHERE id = $1`, [channelId]);
});

const picker = (query: string, visitor: Visitor = producer, episode = episodeId) =>
	visitor.api(`/api/episodes/${episode}/takes/picker${query}`);

/** The reference list filtered in JavaScript: every word in the clip name or the shot. */
function expected(words: string, segmentId?: string): ReferenceTake[] {
	const typed = words.toLowerCase().split(/\s+/).filter(Boolean);
	return reference.filter(
		(take) =>
			(!segmentId || take.segmentId === segmentId) &&
			typed.every(
				(word) =>
					take.clipName.toLowerCase().includes(word) || take.shot.toLowerCase().includes(word)
			)
	);
}

const idsOf = (body: { items: { id: string }[] }) => body.items.map((item) => item.id);

describe('GET /api/episodes/<id>/takes/picker', () => {
	test('with nothing typed it offers the first 20 takes in shot-list order', async () => {
		const answer = await picker('');
		expect(answer.status, JSON.stringify(answer.body)).toBe(200);
		expect(answer.headers.get('cache-control')).toContain('no-store');
		expect(idsOf(answer.body)).toEqual(reference.slice(0, 20).map((take) => take.id));
		expect(answer.body.items[0]).toEqual({
			id: reference[0].id,
			clipName: reference[0].clipName,
			segmentId: reference[0].segmentId,
			shot: reference[0].shot,
			good: expect.any(Boolean),
			sourceIn: expect.stringMatching(/^\d\d:\d\d:\d\d:\d\d$/),
			sourceOut: expect.stringMatching(/^\d\d:\d\d:\d\d:\d\d$/)
		});
	});

	test('it matches clip names case-insensitively, in the reference order', async () => {
		const lower = await picker('?q=pkr_0003&limit=50');
		const upper = await picker('?q=PKR_0003&limit=50');
		expect(lower.status).toBe(200);
		const want = expected('pkr_0003').map((take) => take.id);
		expect(want.length).toBeGreaterThan(10);
		expect(idsOf(lower.body)).toEqual(want.slice(0, 50));
		expect(idsOf(upper.body)).toEqual(idsOf(lower.body));
		// Both spellings were stored: the search found each.
		const names = new Set(lower.body.items.map((item: { clipName: string }) => item.clipName));
		expect(names).toEqual(new Set(['PKR_0003', 'pkr_0003']));
	});

	test('it matches the shot’s words, and every typed word must match', async () => {
		const byShot = await picker('?q=torque&limit=50');
		expect(idsOf(byShot.body)).toEqual(
			expected('torque')
				.slice(0, 50)
				.map((take) => take.id)
		);
		expect(byShot.body.items.length).toBeGreaterThan(0);
		const both = await picker(`?q=${encodeURIComponent('LUG pkr_0002')}&limit=50`);
		expect(idsOf(both.body)).toEqual(
			expected('lug pkr_0002')
				.slice(0, 50)
				.map((take) => take.id)
		);
		expect(both.body.items.every((item: { shot: string }) => /lug/i.test(item.shot))).toBe(true);
	});

	test('a % typed is searched for, not used as a wildcard', async () => {
		// As a LIKE wildcard, "0%" would match every clip name with a 0 in it.
		const answer = await picker(`?q=${encodeURIComponent('0%')}&limit=50`);
		expect(answer.status).toBe(200);
		expect(answer.body.items.length).toBeGreaterThan(0);
		expect(idsOf(answer.body)).toEqual(
			expected('0%')
				.slice(0, 50)
				.map((take) => take.id)
		);
		expect(
			answer.body.items.every((item: { clipName: string }) => item.clipName === 'PKR_100%')
		).toBe(true);
	});

	test('with a segment it offers only that segment’s takes', async () => {
		const answer = await picker(`?segment=${segmentIds[1]}&q=pkr&limit=50`);
		expect(answer.status).toBe(200);
		const want = expected('pkr', segmentIds[1]).map((take) => take.id);
		expect(idsOf(answer.body)).toEqual(want.slice(0, 50));
		expect(
			answer.body.items.every((item: { segmentId: string }) => item.segmentId === segmentIds[1])
		).toBe(true);
		// An empty segment is every segment.
		const every = await picker('?segment=&q=ONLY_SEG');
		expect(every.body.items.map((item: { clipName: string }) => item.clipName)).toEqual([
			'ONLY_SEG_1',
			'ONLY_SEG_2',
			'ONLY_SEG_3'
		]);
	});

	test('limit caps the answer: 50 at most, 20 by default', async () => {
		expect((await picker('?q=pkr')).body.items).toHaveLength(20);
		expect((await picker('?q=pkr&limit=5')).body.items).toHaveLength(5);
		const fifty = await picker('?q=pkr&limit=50');
		expect(idsOf(fifty.body)).toEqual(
			expected('pkr')
				.slice(0, 50)
				.map((take) => take.id)
		);
	});

	test('a bad query is a 400 with a message on its field', async () => {
		const tooMany = await picker('?limit=51');
		expect(tooMany.status).toBe(400);
		expect(tooMany.body.issues.limit[0]).toBe('Ask for at most 50 takes at a time.');
		const notNumber = await picker('?limit=lots');
		expect(notNumber.status).toBe(400);
		expect(notNumber.body.issues.limit[0]).toMatch(/number of takes/);
		const long = await picker(`?q=${'x'.repeat(121)}`);
		expect(long.status).toBe(400);
		expect(long.body.issues.q[0]).toBe('Type at most 120 characters to find a take.');
		const control = await picker(`?q=${encodeURIComponent('PKR\u0007')}`);
		expect(control.status).toBe(400);
		expect(control.body.issues.q[0]).toMatch(/invisible control character/);
		const segment = await picker('?segment=step-two');
		expect(segment.status).toBe(400);
		expect(segment.body.issues.segment[0]).toBe('That is not a segment of this episode.');
	});

	test('another channel’s episode, an unknown id and a non-id are 404; no sign-in is 401', async () => {
		const other = await signedIn(demo.otherProducer);
		const foreign = await picker('?q=pkr', other);
		expect(foreign.status).toBe(404);
		expect(JSON.stringify(foreign.body)).not.toContain('PKR');
		expect((await picker('', producer, '00000000-0000-4000-8000-000000000000')).status).toBe(404);
		expect((await picker('', producer, 'not-an-episode')).status).toBe(404);
		expect((await picker('?q=pkr', new Visitor())).status).toBe(401);
	});
});

/** Every note of the episode, with its take's clip name. */
const notesInDatabase = () =>
	sql<{ id: string; text: string; takeId: string | null; clipName: string | null }>(
		`SELECT segment_note.id, segment_note.text, segment_note.take_id AS "takeId",
		   take.clip_name AS "clipName"
		 FROM segment_note LEFT JOIN take ON take.id = segment_note.take_id
		 WHERE segment_note.episode_id = $1 ORDER BY segment_note.created_at, segment_note.id`,
		[episodeId]
	);
const takeNamed = (clipName: string) => reference.find((take) => take.clipName === clipName)!;
const notesAction = (action: string, form: Record<string, string>) =>
	producer.action(`/episodes/${episodeId}/notes?/${action}`, form);

describe('the notes page without JavaScript: a typed clip name', () => {
	test('a clip name typed in any case names the one take of that name', async () => {
		const result = await notesAction('create', {
			text: 'Hub face on camera, clip typed by hand',
			segmentId: '',
			takeId: '',
			takeClip: ' only_seg_2 ',
			sourceTime: ''
		});
		expect(result.type, JSON.stringify(result)).toBe('redirect');
		const note = (await notesInDatabase()).find((row) => row.text.startsWith('Hub face'));
		expect(note?.takeId).toBe(takeNamed('ONLY_SEG_2').id);
	});

	test('a clip name no take has is a 400 on takeId; what was typed comes back, nothing is written', async () => {
		const before = await notesInDatabase();
		const result = await notesAction('create', {
			text: 'Nothing should be written',
			segmentId: '',
			takeId: '',
			takeClip: 'NO_SUCH_CLIP',
			sourceTime: ''
		});
		expect(result.type).toBe('failure');
		expect(result.status).toBe(400);
		expect(result.data.errors.takeId[0]).toBe(
			'No take of this episode is named “NO_SUCH_CLIP”. Check the clip name on the shot list, or leave the take empty.'
		);
		expect(result.data.values).toMatchObject({
			text: 'Nothing should be written',
			takeClip: 'NO_SUCH_CLIP'
		});
		expect(await notesInDatabase()).toEqual(before);
	});

	test('a clip name two takes share is a 400, unless the segment picks one of them', async () => {
		const form = { text: 'Twin clip note', takeId: '', takeClip: 'TWIN_0001', sourceTime: '' };
		const both = await notesAction('create', { ...form, segmentId: '' });
		expect(both.type).toBe('failure');
		expect(both.data.errors.takeId[0]).toMatch(/^2 takes of this episode are named “TWIN_0001”/);
		const scoped = await notesAction('create', { ...form, segmentId: segmentIds[1] });
		expect(scoped.type, JSON.stringify(scoped)).toBe('redirect');
		const [twin] = await sql<{ takeId: string; segmentId: string }>(
			`SELECT segment_note.take_id AS "takeId", shot.segment_id AS "segmentId"
			 FROM segment_note JOIN take ON take.id = segment_note.take_id JOIN shot ON shot.id = take.shot_id
			 WHERE segment_note.episode_id = $1 AND segment_note.text = 'Twin clip note'`,
			[episodeId]
		);
		expect(twin.segmentId).toBe(segmentIds[1]);
	});

	test('a picked take keeps its id when its clip name is shared; a new clip name wins over a stale id', async () => {
		const [twinOne, twinTwo] = reference.filter((take) => take.clipName === 'TWIN_0001');
		const picked = await notesAction('create', {
			text: 'Picked twin',
			segmentId: '',
			takeId: twinTwo.id,
			takeClip: 'TWIN_0001',
			sourceTime: ''
		});
		expect(picked.type, JSON.stringify(picked)).toBe('redirect');
		let note = (await notesInDatabase()).find((row) => row.text === 'Picked twin')!;
		expect(note.takeId).toBe(twinTwo.id);
		expect(twinOne.id).not.toBe(twinTwo.id);

		// The edit form without JavaScript still carries the old take's id beside the typed name.
		const [{ version }] = await sql<{ version: number }>(
			`SELECT version FROM segment_note WHERE id = $1`,
			[note.id]
		);
		const moved = await notesAction('write', {
			noteId: note.id,
			version: String(version),
			text: 'Picked twin',
			takeId: twinTwo.id,
			takeClip: 'ONLY_SEG_1',
			takeSegmentId: '',
			sourceTime: ''
		});
		expect(moved.type, JSON.stringify(moved)).toBe('success');
		note = (await notesInDatabase()).find((row) => row.id === note.id)!;
		expect(note.takeId).toBe(takeNamed('ONLY_SEG_1').id);
	});

	test('editing a note to a clip name no take has refuses it on takeId and keeps the saved take', async () => {
		const note = (await notesInDatabase()).find((row) => row.clipName === 'ONLY_SEG_1')!;
		const [{ version }] = await sql<{ version: number }>(
			`SELECT version FROM segment_note WHERE id = $1`,
			[note.id]
		);
		const refused = await notesAction('write', {
			noteId: note.id,
			version: String(version),
			text: 'Changed text that must not be saved',
			takeId: note.takeId!,
			takeClip: 'ONLY_SEG_9',
			sourceTime: ''
		});
		expect(refused.type).toBe('failure');
		expect(refused.data.errors.takeId[0]).toMatch(/No take of this episode is named “ONLY_SEG_9”/);
		const after = (await notesInDatabase()).find((row) => row.id === note.id)!;
		expect(after).toEqual(note);
	});

	test('an emptied clip name takes the take off the note', async () => {
		const note = (await notesInDatabase()).find((row) => row.clipName === 'ONLY_SEG_2')!;
		const [{ version }] = await sql<{ version: number }>(
			`SELECT version FROM segment_note WHERE id = $1`,
			[note.id]
		);
		const cleared = await notesAction('write', {
			noteId: note.id,
			version: String(version),
			text: note.text,
			takeId: note.takeId!,
			takeClip: '',
			sourceTime: ''
		});
		expect(cleared.type, JSON.stringify(cleared)).toBe('success');
		expect((await notesInDatabase()).find((row) => row.id === note.id)?.takeId).toBeNull();
	});

	test('a plain form post (no JavaScript) with an unknown clip name shows the message on the page', async () => {
		const response = await producer.request(`/episodes/${episodeId}/notes?/create`, {
			method: 'POST',
			form: {
				text: 'Typed without JavaScript',
				segmentId: '',
				takeId: '',
				takeClip: 'GONE_0042',
				sourceTime: ''
			}
		});
		expect(response.status).toBe(400);
		const html = await response.text();
		expect(html).toContain('No take of this episode is named “GONE_0042”');
		// The typed text and clip name are still in the form.
		expect(html).toContain('Typed without JavaScript');
		expect(html).toMatch(
			/name="takeClip"[^>]*value="GONE_0042"|value="GONE_0042"[^>]*name="takeClip"/
		);
	});
	test('a refused form without JavaScript keeps the picked take beside the typed clip name', async () => {
		// Two takes share this name; the form had the first one picked when the time was refused.
		const [twinOne] = reference.filter((take) => take.clipName === 'TWIN_0001');
		const response = await producer.request(`/episodes/${episodeId}/notes?/create`, {
			method: 'POST',
			form: {
				text: 'Twin with a time that is no time',
				segmentId: '',
				takeId: twinOne.id,
				takeClip: 'TWIN_0001',
				sourceTime: '99:99'
			}
		});
		expect(response.status).toBe(400);
		const html = await response.text();
		const start = html.indexOf('action="?/create"');
		const newNoteForm = html.slice(start, html.indexOf('</form>', start));
		expect(newNoteForm).toContain('value="TWIN_0001"');
		expect(newNoteForm).toMatch(
			new RegExp(`name="takeId"[^>]*value="${twinOne.id}"|value="${twinOne.id}"[^>]*name="takeId"`)
		);
	});
});

describe('the notes page ships only the takes its notes show', () => {
	test('the page has each shown note’s take, and no clip name of a take no note names', async () => {
		const response = await producer.request(`/episodes/${episodeId}/notes`, {
			headers: { accept: 'text/html' }
		});
		expect(response.status).toBe(200);
		const html = await response.text();
		const named = new Set(
			(await notesInDatabase()).map((note) => note.clipName).filter((name) => name !== null)
		);
		expect(named.size).toBeGreaterThan(0);
		for (const clipName of named) expect(html).toContain(clipName);
		const unnamed = [...new Set(reference.map((take) => take.clipName))].filter(
			(clipName) => !named.has(clipName)
		);
		expect(unnamed.length).toBeGreaterThan(5);
		for (const clipName of unnamed) expect(html).not.toContain(clipName);
	});

	test('the notes API no longer lists the episode’s takes, and each note carries its take’s in and out', async () => {
		const answer = await producer.api(`/api/episodes/${episodeId}/notes`);
		expect(answer.status).toBe(200);
		expect(answer.body.takes).toBeUndefined();
		const withTake = answer.body.notes.find(
			(note: { takeClip: string | null }) => note.takeClip === 'TWIN_0001'
		);
		// 9000 and 9300 frames at 30 frames a second (nominal) are 5:00 and 5:10 (SMPTE ST 12-1
		// non-drop counting: 9000 / 30 = 300 s; 9300 / 30 = 310 s).
		expect(withTake).toMatchObject({ takeSourceIn: '00:05:00:00', takeSourceOut: '00:05:10:00' });
	});
});
