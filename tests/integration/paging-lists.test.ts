/**
 * Keyset paging of the lists paged after the episode list: an episode's footage (API and page), its
 * notes (API and page) and the crew page. Walking every page gives every row exactly once, in the
 * order one unpaged SQL query over the same rows gives (the reference: PostgreSQL sorts the whole
 * set itself, so it is not our keyset code checking itself); a damaged cursor is a 400 on `after`;
 * another channel's episode ids answer 404 and a cursor carried to another channel's list only
 * positions that list, never shows a row of the first.
 *
 * Keyset ("seek") paging instead of OFFSET is common practice for long lists (PostgreSQL's
 * documentation of LIMIT and OFFSET: rows skipped by OFFSET are still computed). The cost of a deep
 * page is measured by `npm run bench "episode list"`, not here.
 *
 * The rows live in a channel of this file's own, so the demo channel's lists stay as seeded.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

const EMAIL = 'lists.producer@paging-lists.test';
const FOOTAGE = 130;
const NOTES = 125;
const CREW = 75;
let channelId = '';
let episodeId = '';
let producer: Visitor;

beforeAll(async () => {
	[{ id: channelId }] = await sql<{ id: string }>(
		`INSERT INTO channel (name, frame_rate) VALUES ('Zz list bay', '29.97') RETURNING id`
	);
	const [person] = await sql<{ id: string }>(
		`INSERT INTO person (email, name, password_hash)
		 SELECT $1, 'Aa List Producer', password_hash FROM person WHERE email = $2 RETURNING id`,
		[EMAIL, demo.producer]
	);
	await sql(
		`INSERT INTO membership (channel_id, person_id, roles) VALUES ($1, $2, ARRAY['producer','camera','merch'])`,
		[channelId, person.id]
	);
	[{ id: episodeId }] = await sql<{ id: string }>(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate)
		 VALUES ($1, 'List bay test episode', 'list-bay-test', 600, '29.97') RETURNING id`,
		[channelId]
	);
	await sql(
		`INSERT INTO segment (episode_id, position, kind, title)
		 SELECT $1, i, 'install-step', 'List step ' || i FROM generate_series(1, 4) AS i`,
		[episodeId]
	);
	// 130 clips in one statement (one upload time for all), 7 clip names, 3 cameras and none on every
	// fourth, 5 sizes, no length on every third: most rows tie with others on the sort key.
	await sql(
		`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, camera_label, clip_name,
		   file_name, file_type, size_bytes, sha256, duration_seconds)
		 SELECT $1, $2, 'list-bay-' || i, 'footage',
		   CASE WHEN i % 4 = 0 THEN '' ELSE (ARRAY['A cam','B cam','C cam'])[1 + i % 3] END,
		   'LB_' || (i % 7), 'LB_' || i || '.mov', 'video/quicktime', 1000000 * (1 + i % 5),
		   repeat('0', 64), CASE WHEN i % 3 = 0 THEN NULL ELSE 12.5 + (i % 4) * 0.1 END
		 FROM generate_series(1, ${FOOTAGE}) AS i`,
		[channelId, episodeId]
	);
	// 125 notes: program frames in runs of 5 and none on every sixth, segments on most, one writing
	// time for all (ties broken by segment position, then id).
	await sql(
		`INSERT INTO segment_note (episode_id, segment_id, program_frame, text, author_id)
		 SELECT $1, (SELECT id FROM segment WHERE episode_id = $1 AND position = 1 + i % 4),
		   CASE WHEN i % 6 = 0 THEN NULL ELSE 300 * (i % 20) END, 'List note ' || i, $2
		 FROM generate_series(1, ${NOTES}) AS i`,
		[episodeId, person.id]
	);
	// 74 more crew members whose names repeat in runs of 5 (ties broken by id), every third disabled.
	await sql(
		`WITH added AS (
		   INSERT INTO person (email, name)
		   SELECT 'lists.crew.' || i || '@paging-lists.test', 'Bench hand ' || (i % 15)
		   FROM generate_series(1, ${CREW - 1}) AS i
		   RETURNING id, email)
		 INSERT INTO membership (channel_id, person_id, roles, disabled_at)
		 SELECT $1, id, ARRAY['camera'],
		   CASE WHEN substring(email FROM 'crew\\.(\\d+)@')::int % 3 = 0 THEN now() END FROM added`,
		[channelId]
	);
	producer = await signedIn(EMAIL);
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM membership WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM person WHERE email LIKE '%@paging-lists.test'`);
});

/** Follows `next` from the first page to the last, as `visitor`; every page's rows in order. */
async function walk(
	path: string,
	rowsOf: (body: any) => { id: string }[],
	visitor: Visitor = producer
): Promise<{ ids: string[]; pages: number }> {
	const ids: string[] = [];
	let pages = 0;
	let next: string | null = null;
	do {
		const separator = path.includes('?') ? '&' : '?';
		const answer = await visitor.api(
			next ? `${path}${separator}after=${encodeURIComponent(next)}` : path
		);
		expect(answer.status, JSON.stringify(answer.body)).toBe(200);
		ids.push(...rowsOf(answer.body).map((row) => row.id));
		next = answer.body.next;
		pages++;
		expect(pages).toBeLessThan(100);
	} while (next);
	return { ids, pages };
}

/** The reference order of an episode's footage: one unpaged query, PostgreSQL sorting it all. */
async function footageReference(orderBy: string, where = 'TRUE') {
	const rows = await sql<{ id: string }>(
		`SELECT id FROM footage WHERE episode_id = $1 AND ${where} ORDER BY ${orderBy}`,
		[episodeId]
	);
	return rows.map((row) => row.id);
}

/** Links a page's HTML offers: the "More …" link (with `&amp;` read back) and the rows shown. */
function moreLink(html: string, label: string): string | null {
	const match = new RegExp(`<a href="([^"]+)"[^>]*rel="next"[^>]*>${label}</a>`).exec(html);
	return match ? match[1].replace(/&amp;/g, '&') : null;
}

async function page(path: string): Promise<string> {
	const answer = await producer.request(path, { headers: { accept: 'text/html' } });
	expect(answer.status).toBe(200);
	return answer.text();
}

describe('footage paging', () => {
	const orders = [
		{ sort: 'created', direction: 'desc', sql: 'created_at DESC, id DESC' },
		{ sort: 'created', direction: 'asc', sql: 'created_at ASC, id ASC' },
		{ sort: 'clip', direction: 'asc', sql: 'clip_name ASC, id ASC' },
		{ sort: 'clip', direction: 'desc', sql: 'clip_name DESC, id DESC' },
		{ sort: 'camera', direction: 'asc', sql: 'camera_label ASC, id ASC' },
		{ sort: 'size', direction: 'desc', sql: 'size_bytes DESC, id DESC' },
		{ sort: 'duration', direction: 'asc', sql: 'coalesce(duration_seconds, -1) ASC, id ASC' },
		{ sort: 'duration', direction: 'desc', sql: 'coalesce(duration_seconds, -1) DESC, id DESC' }
	];

	test.each(orders)(
		'walking pages of 17 sorted by $sort $direction gives every clip once, in the reference order',
		async (order) => {
			const { ids, pages } = await walk(
				`/api/episodes/${episodeId}/footage?sort=${order.sort}&direction=${order.direction}&limit=17`,
				(body) => body.footage
			);
			expect(pages).toBe(Math.ceil(FOOTAGE / 17));
			expect(new Set(ids).size).toBe(FOOTAGE);
			expect(ids).toEqual(await footageReference(order.sql));
		}
	);

	test('the default order is newest first, and filters apply on every page', async () => {
		const { ids } = await walk(`/api/episodes/${episodeId}/footage?limit=50`, (b) => b.footage);
		expect(ids).toEqual(await footageReference('created_at DESC, id DESC'));
		const { ids: bCam } = await walk(
			`/api/episodes/${episodeId}/footage?camera=B%20cam&sort=clip&limit=7`,
			(body) => body.footage
		);
		expect(bCam).toEqual(await footageReference('clip_name ASC, id ASC', `camera_label = 'B cam'`));
		expect(bCam.length).toBeGreaterThan(7);
	});

	test('the totals and camera names cover the whole episode, not only the page', async () => {
		const answer = await producer.api(`/api/episodes/${episodeId}/footage?limit=5`);
		expect(answer.body.footage).toHaveLength(5);
		expect(answer.body.totals.files).toBe(FOOTAGE);
		const [{ bytes }] = await sql<{ bytes: string }>(
			`SELECT sum(size_bytes)::text AS bytes FROM footage WHERE episode_id = $1`,
			[episodeId]
		);
		expect(answer.body.totals.bytes).toBe(Number(bytes));
		expect(answer.body.totals.cameras).toEqual(['A cam', 'B cam', 'C cam']);
	});

	test('a damaged cursor, one of another sort, a forged one or a bad limit is a 400 on its field', async () => {
		const base = `/api/episodes/${episodeId}/footage`;
		const damaged = await producer.api(`${base}?after=not*a*cursor`);
		expect(damaged.status).toBe(400);
		expect(damaged.body.issues.after[0]).toMatch(/first page/);
		const first = (await producer.api(`${base}?limit=5`)).body;
		const otherSort = await producer.api(
			`${base}?sort=size&after=${encodeURIComponent(first.next)}`
		);
		expect(otherSort.status).toBe(400);
		expect(otherSort.body.issues.after[0]).toMatch(/first page/);
		// Well-formed base64url JSON with values of the wrong kind never reaches the database.
		for (const keys of [
			['12.5x', '00000000-0000-4000-8000-000000000000'],
			['1e999', '00000000-0000-4000-8000-000000000000'],
			['1e-999', '00000000-0000-4000-8000-000000000000'],
			['12.5', 'not-an-id']
		]) {
			const forged = Buffer.from(JSON.stringify({ o: 'duration:asc', k: keys })).toString(
				'base64url'
			);
			const answer = await producer.api(`${base}?sort=duration&direction=asc&after=${forged}`);
			expect(answer.status, keys.join()).toBe(400);
			expect(answer.body.issues.after).toBeDefined();
		}
		for (const limit of ['0', '201', 'lots']) {
			const answer = await producer.api(`${base}?limit=${limit}`);
			expect(answer.status).toBe(400);
			expect(answer.body.issues.limit).toBeDefined();
		}
		const badSort = await producer.api(`${base}?sort=colour`);
		expect(badSort.status).toBe(400);
		expect(badSort.body.issues.sort).toBeDefined();
	});

	test('another channel’s episode is not found, and a cursor carried there shows only its rows', async () => {
		const demoProducer = await signedIn(demo.producer);
		const [demoEpisode] = await sql<{ id: string }>(
			`SELECT e.id FROM episode e JOIN footage f ON f.episode_id = e.id
			 WHERE e.channel_id <> $1 GROUP BY e.id ORDER BY count(*) DESC LIMIT 1`,
			[channelId]
		);
		expect((await producer.api(`/api/episodes/${demoEpisode.id}/footage`)).status).toBe(404);
		expect((await demoProducer.api(`/api/episodes/${episodeId}/footage`)).status).toBe(404);
		const mine = (await producer.api(`/api/episodes/${episodeId}/footage?sort=clip&limit=3`)).body;
		const carried = await demoProducer.api(
			`/api/episodes/${demoEpisode.id}/footage?sort=clip&after=${encodeURIComponent(mine.next)}`
		);
		expect(carried.status).toBe(200);
		const theirs = new Set(
			(
				await sql<{ id: string }>(`SELECT id FROM footage WHERE episode_id = $1`, [demoEpisode.id])
			).map((row) => row.id)
		);
		expect(carried.body.footage.every((row: { id: string }) => theirs.has(row.id))).toBe(true);
	});

	test('the footage page shows one page, sort links and a “More footage” link that keeps them', async () => {
		const html = await page(`/episodes/${episodeId}/footage?sort=clip&direction=asc`);
		const shown: string[] = html.match(/LB_\d+\.mov/g) ?? [];
		expect(new Set(shown).size).toBe(50);
		expect(html).toContain(`${FOOTAGE} files`);
		const next = moreLink(html, 'More footage');
		expect(next).not.toBeNull();
		expect(next).toMatch(/sort=clip/);
		expect(next).toMatch(/direction=asc/);
		const second = await page(`/episodes/${episodeId}/footage${next}`);
		const secondShown: string[] = second.match(/LB_\d+\.mov/g) ?? [];
		expect(new Set(secondShown).size).toBe(50);
		expect(secondShown.filter((name) => shown.includes(name))).toEqual([]);
		expect(second).toContain('Back to the first page');
		// Every clip's file name, in the reference order, across the pages the links lead to.
		const reference = await sql<{ file_name: string }>(
			`SELECT file_name FROM footage WHERE episode_id = $1 ORDER BY clip_name, id`,
			[episodeId]
		);
		expect([...new Set(shown), ...new Set(secondShown)]).toEqual(
			reference.slice(0, 100).map((row) => row.file_name)
		);
	});

	test('a damaged cursor on the footage page starts from the top and says why', async () => {
		const html = await page(`/episodes/${episodeId}/footage?after=%%%`);
		expect(html).toMatch(/first page and try again/);
		expect(new Set(html.match(/LB_\d+\.mov/g) ?? []).size).toBe(50);
	});
});

describe('notes paging', () => {
	const notesReference = async () =>
		(
			await sql<{ id: string }>(
				`SELECT n.id FROM segment_note n LEFT JOIN segment s ON s.id = n.segment_id
				 WHERE n.episode_id = $1
				 ORDER BY n.program_frame ASC NULLS LAST, s.position ASC NULLS LAST, n.created_at, n.id`,
				[episodeId]
			)
		).map((row) => row.id);

	test('walking the notes 11 at a time gives every note once, in program-time order', async () => {
		const { ids, pages } = await walk(
			`/api/episodes/${episodeId}/notes?limit=11`,
			(body) => body.notes
		);
		expect(pages).toBe(Math.ceil(NOTES / 11));
		expect(new Set(ids).size).toBe(NOTES);
		expect(ids).toEqual(await notesReference());
	});

	test('every page carries the episode’s counts, not the page’s', async () => {
		const answer = await producer.api(`/api/episodes/${episodeId}/notes?limit=3`);
		expect(answer.body.notes).toHaveLength(3);
		const [{ placed }] = await sql<{ placed: number }>(
			`SELECT count(*)::int AS placed FROM segment_note WHERE episode_id = $1 AND program_frame IS NOT NULL`,
			[episodeId]
		);
		expect(answer.body.counts).toEqual({ notes: NOTES, placed });
	});

	test('a damaged or forged notes cursor is a 400 on after; another channel’s notes are not found', async () => {
		const base = `/api/episodes/${episodeId}/notes`;
		expect((await producer.api(`${base}?after=AAAA`)).body.issues.after).toBeDefined();
		const forged = Buffer.from(
			JSON.stringify({ o: 'program:asc', k: ['12a', '1', '2027-01-01 00:00:00+00', 'x'] })
		).toString('base64url');
		const answer = await producer.api(`${base}?after=${forged}`);
		expect(answer.status).toBe(400);
		expect(answer.body.issues.after[0]).toMatch(/first page/);
		const demoProducer = await signedIn(demo.producer);
		expect((await demoProducer.api(base)).status).toBe(404);
	});

	test('the notes page shows the first page and a “More notes” link to the rest', async () => {
		const html = await page(`/episodes/${episodeId}/notes`);
		const shown = new Set(html.match(/List note \d+\b/g) ?? []);
		expect(shown.size).toBe(50);
		expect(html).toContain(`${NOTES} notes`);
		const next = moreLink(html, 'More notes');
		expect(next).toMatch(/^\?after=/);
		const second = await page(`/episodes/${episodeId}/notes${next}`);
		const secondShown = new Set(second.match(/List note \d+\b/g) ?? []);
		expect(secondShown.size).toBe(50);
		expect([...secondShown].filter((text) => shown.has(text))).toEqual([]);
	});
	test('a note written on a long list lands on the page that shows it', async () => {
		// Without a program time it sorts after the 104 placed notes: on the third page of 50.
		const result = await producer.action(`/episodes/${episodeId}/notes?/create`, {
			text: 'Late list note for the anchor'
		});
		expect(result.type).toBe('redirect');
		const [path, anchor] = result.location!.split('#');
		const html = await page(path);
		const [created] = await sql<{ id: string }>(
			`SELECT id FROM segment_note WHERE episode_id = $1 AND text = 'Late list note for the anchor'`,
			[episodeId]
		);
		expect(anchor).toBe(`note-${created.id}`);
		expect(html).toContain(`id="note-${created.id}"`);
		await sql(`DELETE FROM segment_note WHERE id = $1`, [created.id]);
	});
});

describe('crew page paging', () => {
	test('the crew page shows 50 people, the channel’s counts and a “More crew” link to the rest', async () => {
		const reference = await sql<{ email: string }>(
			`SELECT p.email FROM membership m JOIN person p ON p.id = m.person_id
			 WHERE m.channel_id = $1 AND p.email LIKE 'lists.crew.%' ORDER BY p.name, p.id`,
			[channelId]
		);
		const [{ active }] = await sql<{ active: number }>(
			`SELECT count(*)::int AS active FROM membership WHERE channel_id = $1 AND disabled_at IS NULL`,
			[channelId]
		);
		// Every third added member is disabled: 24 of 74, so the page's counts are not the page's rows.
		expect(active).toBe(CREW - 24);
		// In markup order (the page's data payload repeats them after the markup); the producer's
		// own address is also in the page's header, so only the crew's other members count here.
		const emailsIn = (html: string) => [
			...new Set(html.match(/lists\.crew\.\d+@paging-lists\.test/g))
		];
		const html = await page('/crew');
		expect(html).toContain(`${active} active · ${CREW} in all`);
		const next = moreLink(html, 'More crew');
		expect(next).toMatch(/^\?after=/);
		const second = await page(`/crew${next}`);
		expect(moreLink(second, 'More crew')).toBeNull();
		expect(second).toContain(`${active} active · ${CREW} in all`);
		expect([...emailsIn(html), ...emailsIn(second)]).toEqual(reference.map((row) => row.email));
	});

	test('a damaged crew cursor starts from the top and says why', async () => {
		const html = await page('/crew?after=AAAA');
		expect(html).toMatch(/first page and try again/);
		expect(moreLink(html, 'More crew')).not.toBeNull();
	});
});
