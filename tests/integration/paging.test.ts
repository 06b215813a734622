/**
 * Keyset paging over HTTP: walking every page of a list gives every row exactly once, in the same
 * order as one big page, even where many rows tie on the sort key (same publish date, same title,
 * same creation time); a damaged cursor or one made for another order is a 400 on `after`; the
 * episode picker searches only the caller's channel; the catalogue's count stops at 250.
 *
 * Keyset ("seek") paging instead of OFFSET is common practice for long lists (PostgreSQL's own
 * documentation of LIMIT and OFFSET warns that rows skipped by OFFSET are still computed, so a
 * deep page costs as much as all pages before it). The checks here are about correctness; the
 * cost is measured by `npm run bench "episode list"` and `npm run bench parts`.
 *
 * The rows live in a channel of this file's own, so the demo channel's lists stay as seeded.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

const EMAIL = 'paging.producer@paging.test';
const EPISODES = 120;
const PARTS = 1_100;
let channelId = '';
let producer: Visitor;

interface EpisodeRow {
	id: string;
	title: string;
	publishDate: string | null;
	stage: string;
	createdAt: string;
}

beforeAll(async () => {
	[{ id: channelId }] = await sql<{ id: string }>(
		`INSERT INTO channel (name, frame_rate) VALUES ('Zz paging bay', '29.97') RETURNING id`
	);
	const [person] = await sql<{ id: string }>(
		`INSERT INTO person (email, name, password_hash)
		 SELECT $1, 'Paging Producer', password_hash FROM person WHERE email = $2 RETURNING id`,
		[EMAIL, demo.producer]
	);
	await sql(
		`INSERT INTO membership (channel_id, person_id, roles) VALUES ($1, $2, ARRAY['producer','merch'])`,
		[channelId, person.id]
	);
	// 120 episodes in one statement (one creation time for all), 30 distinct titles, 6 publish
	// dates and no date on every fifth: most rows tie with others on every sort key but the id.
	await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, publish_date)
		 SELECT $1, 'Paging run ' || (i % 30), 'paging-run-' || i, 600, '29.97',
		   (ARRAY['script','shoot','edit','locked','published'])[1 + i % 5],
		   CASE WHEN i % 5 = 0 THEN NULL ELSE DATE '2027-01-01' + (i % 6) END
		 FROM generate_series(1, ${EPISODES}) AS i`,
		[channelId]
	);
	// 1,100 parts, ten prices only, so the price sort ties in runs of 110.
	await sql(
		`INSERT INTO part (channel_id, sku, name, category, brand, price_cents, store_url)
		 SELECT $1, 'PG-' || lpad(i::text, 5, '0'), 'Paging spacer ' || (i % 40), 'Spacers', 'Bayline Forge',
		   1000 * (1 + i % 10), 'https://shop.example.test/p/pg-' || i
		 FROM generate_series(1, ${PARTS}) AS i`,
		[channelId]
	);
	// 119 more crew members whose names repeat in runs of 6 (ties broken by id).
	await sql(
		`WITH added AS (
		   INSERT INTO person (email, name)
		   SELECT 'paging.crew.' || i || '@paging.test', 'Bay hand ' || (i % 20) FROM generate_series(1, 119) AS i
		   RETURNING id)
		 INSERT INTO membership (channel_id, person_id, roles) SELECT $1, id, ARRAY['camera'] FROM added`,
		[channelId]
	);
	producer = await signedIn(EMAIL);
});

afterAll(async () => {
	await sql(`DELETE FROM person WHERE email LIKE 'paging.crew.%@paging.test'`);
	await sql(`DELETE FROM part WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM episode WHERE channel_id = $1`, [channelId]);
});

/** Follows `next` from the first page to the last; every page's rows in order. */
async function walk<Row>(
	path: string,
	rowsOf: (body: any) => Row[],
	nextOf: (body: any) => string | null = (body) => body.next
): Promise<{ rows: Row[]; pages: number }> {
	const rows: Row[] = [];
	let pages = 0;
	let next: string | null = null;
	do {
		const separator = path.includes('?') ? '&' : '?';
		const answer = await producer.api(
			next ? `${path}${separator}after=${encodeURIComponent(next)}` : path
		);
		expect(answer.status, JSON.stringify(answer.body)).toBe(200);
		rows.push(...rowsOf(answer.body));
		next = nextOf(answer.body);
		pages++;
		expect(pages).toBeLessThan(200);
	} while (next);
	return { rows, pages };
}

describe('episode list paging', () => {
	const orders = ['publish', 'title', 'stage', 'created'].flatMap((sort) =>
		['asc', 'desc'].map((direction) => ({ sort, direction }))
	);

	test.each(orders)(
		'walking pages of 17 sorted by $sort $direction gives every episode once, in one stable order',
		async ({ sort, direction }) => {
			const query = `/api/episodes?sort=${sort}&direction=${direction}`;
			const whole = (await producer.api(`${query}&limit=200`)).body;
			expect(whole.next).toBeNull();
			expect(whole.items).toHaveLength(EPISODES);
			const { rows, pages } = await walk<EpisodeRow>(`${query}&limit=17`, (body) => body.items);
			expect(pages).toBe(Math.ceil(EPISODES / 17));
			expect(new Set(rows.map((row) => row.id)).size).toBe(EPISODES);
			expect(rows.map((row) => row.id)).toEqual(whole.items.map((row: EpisodeRow) => row.id));
			if (sort === 'publish') {
				// Going up, episodes without a date come last; going down, first.
				const dates = rows.map((row) => row.publishDate ?? '9999-12-31');
				const sorted = [...dates].sort();
				expect(dates).toEqual(direction === 'asc' ? sorted : sorted.reverse());
			}
		}
	);

	test('filters still apply on every page', async () => {
		const { rows } = await walk<EpisodeRow>('/api/episodes?stage=edit&limit=7', (b) => b.items);
		expect(rows).toHaveLength(EPISODES / 5);
		expect(rows.every((row) => row.stage === 'edit')).toBe(true);
	});

	test('a damaged cursor, a cursor of another order or a bad limit is a 400 on its field', async () => {
		const first = (await producer.api('/api/episodes?limit=5')).body;
		const damaged = await producer.api('/api/episodes?after=not*a*cursor');
		expect(damaged.status).toBe(400);
		expect(damaged.body.issues.after[0]).toMatch(/first page/);
		const otherOrder = await producer.api(
			`/api/episodes?sort=title&after=${encodeURIComponent(first.next)}`
		);
		expect(otherOrder.status).toBe(400);
		expect(otherOrder.body.issues.after[0]).toMatch(/first page/);
		// Well-formed base64url JSON holding values of the wrong kind never reaches the database.
		const forged = Buffer.from(
			JSON.stringify({ o: 'publish:asc', k: ['2027-02-30', 'x', 'not-an-id'] })
		).toString('base64url');
		const forgedAnswer = await producer.api(`/api/episodes?after=${forged}`);
		expect(forgedAnswer.status).toBe(400);
		expect(forgedAnswer.body.issues.after).toBeDefined();
		for (const limit of ['0', '201', 'lots']) {
			const answer = await producer.api(`/api/episodes?limit=${limit}`);
			expect(answer.status).toBe(400);
			expect(answer.body.issues.limit).toBeDefined();
		}
	});

	test('the episodes page shows one page and a “More episodes” link to the next', async () => {
		const html = await (
			await producer.request('/episodes?sort=title', { headers: { accept: 'text/html' } })
		).text();
		const shown: string[] = html.match(/href="\/episodes\/[0-9a-f-]{36}"/g) ?? [];
		expect(shown).toHaveLength(50);
		const more = /<a href="([^"]+)"[^>]*rel="next"[^>]*>More episodes<\/a>/.exec(html);
		expect(more).not.toBeNull();
		const nextUrl = more![1].replace(/&amp;/g, '&');
		expect(nextUrl).toMatch(/[?&]after=/);
		expect(nextUrl).toMatch(/sort=title/);
		const second = await (
			await producer.request(nextUrl, { headers: { accept: 'text/html' } })
		).text();
		const secondShown: string[] = second.match(/href="\/episodes\/[0-9a-f-]{36}"/g) ?? [];
		expect(secondShown).toHaveLength(50);
		expect(secondShown.filter((link) => shown.includes(link))).toEqual([]);
		expect(second).toContain('Back to the first page');
	});
});

describe('episode picker', () => {
	test('finds the channel’s episodes by words of the title, a few at a time', async () => {
		const answer = await producer.api('/api/episodes/picker?q=run%2012');
		expect(answer.status).toBe(200);
		// 'Paging run 12' is the title of episodes 12, 42, 72 and 102.
		expect(answer.body.items).toHaveLength(4);
		expect(answer.body.items.every((e: EpisodeRow) => e.title === 'Paging run 12')).toBe(true);
		const few = await producer.api('/api/episodes/picker?q=paging&limit=5');
		expect(few.body.items).toHaveLength(5);
		const except = few.body.items[0].id;
		const without = await producer.api(`/api/episodes/picker?q=paging&limit=50&except=${except}`);
		expect(without.body.items.map((e: EpisodeRow) => e.id)).not.toContain(except);
	});

	test('never offers another channel’s episodes, and asks who is calling', async () => {
		const demoProducer = await signedIn(demo.producer);
		const mine = await demoProducer.api('/api/episodes/picker?q=paging%20run');
		expect(mine.status).toBe(200);
		expect(mine.body.items).toEqual([]);
		const theirs = await producer.api('/api/episodes/picker?q=Sandpiper');
		expect(theirs.body.items).toEqual([]);
		expect((await new Visitor().api('/api/episodes/picker?q=paging')).status).toBe(401);
	});

	test('a search it cannot read is a 400 on its field', async () => {
		const long = await producer.api(`/api/episodes/picker?q=${'a'.repeat(121)}`);
		expect(long.status).toBe(400);
		expect(long.body.issues.q).toBeDefined();
		const except = await producer.api('/api/episodes/picker?except=nope');
		expect(except.status).toBe(400);
		expect(except.body.issues.except).toBeDefined();
	});
});

describe('crew paging', () => {
	test('walking the crew 13 at a time gives every member once, by name', async () => {
		const { rows } = await walk<{ id: string; name: string }>('/api/crew?limit=13', (b) => b.items);
		expect(rows).toHaveLength(120);
		expect(new Set(rows.map((row) => row.id)).size).toBe(120);
		const whole = (await producer.api('/api/crew?limit=200')).body;
		expect(whole.next).toBeNull();
		expect(rows.map((row) => row.id)).toEqual(whole.items.map((row: { id: string }) => row.id));
		expect((await producer.api('/api/crew?after=AAAA')).status).toBe(400);
	});
});

describe('catalogue paging and count', () => {
	test('counts matching parts up to 250 and says there are more', async () => {
		const all = await producer.api('/api/parts');
		expect(all.status).toBe(200);
		expect(all.body.total).toBe(250);
		expect(all.body.totalCapped).toBe(true);
		const few = await producer.api('/api/parts?q=PG-0000');
		expect(few.body.totalCapped).toBe(false);
		expect(few.body.total).toBe(9); // PG-00001 … PG-00009
		// PG-00100 … PG-00199: under the cap, counted exactly.
		const hundred = await producer.api('/api/parts?q=PG-001&pageSize=25');
		expect(hundred.body).toMatchObject({ total: 100, totalCapped: false, pages: 4 });
	});

	test('every page of a search says the same count, the last page reached by cursor too', async () => {
		// PG-00001 … PG-00099: 99 parts, pages of 25, 25, 25 and 24.
		const totals: number[] = [];
		const sizes: number[] = [];
		let after: string | null = null;
		do {
			const answer = await producer.api(
				`/api/parts?q=PG-000&pageSize=25${after ? `&after=${encodeURIComponent(after)}` : ''}`
			);
			expect(answer.status).toBe(200);
			totals.push(answer.body.total);
			sizes.push(answer.body.parts.length);
			after = answer.body.next;
		} while (after);
		expect(sizes).toEqual([25, 25, 25, 24]);
		expect(totals).toEqual([99, 99, 99, 99]);
		// A first page holding every match is its own count, with a single page.
		const one = await producer.api('/api/parts?q=PG-0000&pageSize=25');
		expect(one.body).toMatchObject({ total: 9, totalCapped: false, pages: 1, next: null });
	});

	test('walking the catalogue by price with cursors gives every part once, ties in SKU order', async () => {
		const { rows } = await walk<{ id: string; sku: string; priceCents: number }>(
			'/api/parts?sort=price&dir=desc&pageSize=100',
			(body) => body.parts
		);
		expect(rows).toHaveLength(PARTS);
		expect(new Set(rows.map((row) => row.id)).size).toBe(PARTS);
		for (let index = 1; index < rows.length; index++) {
			const [before, after] = [rows[index - 1], rows[index]];
			expect(before.priceCents).toBeGreaterThanOrEqual(after.priceCents);
			if (before.priceCents === after.priceCents) expect(before.sku > after.sku).toBe(true);
		}
	});

	test('a damaged catalogue cursor is a 400 on after', async () => {
		const answer = await producer.api('/api/parts?after=%%%');
		expect(answer.status).toBe(400);
		expect(answer.body.issues.after).toBeDefined();
	});
});
