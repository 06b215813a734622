/**
 * The Storage view over HTTP against the built server: GET /api/storage sums the sizes of rows of
 * known size written for fresh episodes, pages episodes largest first with a keyset cursor, lists
 * published episodes whose rushes could be archived, and shows a caller only their own channel.
 *
 * Sizes use decimal SI prefixes: 1 GB = 10^9 bytes, 1 MB = 10^6 bytes (NIST SP 811 §4; tests/REFERENCES.md,
 * "Units" and "Recording storage"). Every expected number below is hand-worked arithmetic.
 */
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { hostileString } from '../helpers/hostile';
import { formatBytes } from '$lib/components/uploads/format';
import { baseUrl, demo, signedIn, sql, type Visitor } from '../helpers/http';
import { channelOf, removeEpisodes, storageEpisode } from '../helpers/storage-fixture';

const GB = 1e9; // NIST SP 811 §4: giga = 10^9
const MB = 1e6; // mega = 10^6
const created: string[] = [];
let channelId = '';
let producer: Visitor;
let before: any;
const ids = { axle: '', archived: '', recent: '', plannedOnly: '' };

beforeAll(async () => {
	channelId = await channelOf('mule-rear-block-lift');
	producer = await signedIn(demo.producer);
	before = (await producer.api('/api/storage')).body;

	// In the edit bay: three rushes, one cut, made files, one upload arriving, one finished upload.
	ids.axle = await storageEpisode(channelId, {
		title: 'Storage test: long-bed axle swap',
		stage: 'edit',
		clips: [
			{
				purpose: 'footage',
				bytes: 2 * GB,
				made: { proxy: 200 * MB, poster: 150_000, sprite: 2_400_000, peaks: 48_000 }
			},
			{ purpose: 'footage', bytes: 1.5 * GB },
			{ purpose: 'footage', bytes: 0.5 * GB },
			{
				purpose: 'cut',
				bytes: 750 * MB,
				// The sprite is still waiting: no bytes yet, so it adds nothing.
				made: { proxy: 40 * MB, poster: 100_000, sprite: null, peaks: 12_000 }
			}
		],
		arriving: [1 * GB],
		// A finished upload is counted through its footage row, never twice.
		finished: [9_999]
	});
	// Published 45 days ago: its rushes are offered for archiving.
	ids.archived = await storageEpisode(channelId, {
		title: 'Storage test: tailgate hinge rebuild',
		stage: 'published',
		clips: [
			{ purpose: 'footage', bytes: 3 * GB, made: { proxy: 100 * MB } },
			{ purpose: 'cut', bytes: 600 * MB }
		],
		publishedDaysAgo: 45
	});
	// Published 10 days ago: not yet.
	ids.recent = await storageEpisode(channelId, {
		title: 'Storage test: brake line flare',
		stage: 'published',
		clips: [{ purpose: 'footage', bytes: 2 * GB }],
		publishedDaysAgo: 10
	});
	// Published with no recorded move, only a publish date 40 days ago: the date counts.
	ids.plannedOnly = await storageEpisode(channelId, {
		title: 'Storage test: seat track shim',
		stage: 'published',
		clips: [{ purpose: 'footage', bytes: 1 * MB }],
		publishDateDaysAgo: 40
	});
	created.push(...Object.values(ids));
});
afterAll(() => removeEpisodes(created));

describe('GET /api/storage', () => {
	test('sums one episode by kind (hand-worked)', async () => {
		const { status, body } = await producer.api('/api/storage');
		expect(status).toBe(200);
		const axle = body.episodes.find((e: any) => e.id === ids.axle);
		// Rushes: 2 GB + 1.5 GB + 0.5 GB = 4 GB = 4,000,000,000 bytes.
		expect(axle.rushesBytes).toBe(4_000_000_000);
		// Cuts: one cut of 750 MB = 750,000,000 bytes.
		expect(axle.cutsBytes).toBe(750_000_000);
		// Made: (200,000,000 + 150,000 + 2,400,000 + 48,000) + (40,000,000 + 100,000 + 0 + 12,000)
		//     = 202,598,000 + 40,112,000 = 242,710,000 bytes.
		expect(axle.madeBytes).toBe(242_710_000);
		// Arriving: the one unfinished upload's declared 1 GB; the finished 9,999 bytes are not added.
		expect(axle.arrivingBytes).toBe(1_000_000_000);
		// Total: 4,000,000,000 + 750,000,000 + 242,710,000 + 1,000,000,000 = 5,992,710,000.
		expect(axle.totalBytes).toBe(5_992_710_000);
		expect(axle.stage).toBe('edit');
	});

	test('channel totals grow by exactly what the fresh episodes hold (hand-worked)', async () => {
		const { body } = await producer.api('/api/storage');
		const grew = (key: string) => body.channel[key] - before.channel[key];
		// Rushes: 4 GB + 3 GB + 2 GB + 1 MB = 9,001,000,000.
		expect(grew('rushesBytes')).toBe(9_001_000_000);
		// Cuts: 750 MB + 600 MB = 1,350,000,000.
		expect(grew('cutsBytes')).toBe(1_350_000_000);
		expect(grew('arrivingBytes')).toBe(1_000_000_000);
		// Made: 242,710,000 + 100,000,000 = 342,710,000; by kind: proxies 200 + 40 + 100 MB,
		// posters 150,000 + 100,000, sprites 2,400,000, waveforms 48,000 + 12,000.
		expect(grew('madeBytes')).toBe(342_710_000);
		expect(body.channel.madeByKind.proxy - before.channel.madeByKind.proxy).toBe(340_000_000);
		expect(body.channel.madeByKind.poster - before.channel.madeByKind.poster).toBe(250_000);
		expect(body.channel.madeByKind.sprite - before.channel.madeByKind.sprite).toBe(2_400_000);
		expect(body.channel.madeByKind.peaks - before.channel.madeByKind.peaks).toBe(60_000);
		// Counted against the quota: rushes + cuts + arriving = 9,001,000,000 + 1,350,000,000 +
		// 1,000,000,000 = 11,351,000,000 (made files are not counted, as when an upload is started).
		expect(grew('countedBytes')).toBe(11_351_000_000);
		expect(grew('episodesHolding')).toBe(4);
	});

	test('channel totals match the database and the quota is in decimal gigabytes', async () => {
		const { body } = await producer.api('/api/storage');
		const [row] = await sql(
			`SELECT c.storage_quota_gb,
				(SELECT coalesce(sum(size_bytes), 0) FROM footage WHERE channel_id = c.id AND purpose = 'footage') AS rushes,
				(SELECT coalesce(sum(size_bytes), 0) FROM footage WHERE channel_id = c.id AND purpose = 'cut') AS cuts
			 FROM channel c WHERE c.id = $1`,
			[channelId]
		);
		expect(body.channel.rushesBytes).toBe(Number(row.rushes));
		expect(body.channel.cutsBytes).toBe(Number(row.cuts));
		// Quota in GB × 10^9 (NIST SP 811 §4).
		expect(body.channel.quotaBytes).toBe(row.storage_quota_gb * 1e9);
	});

	test('offers rushes of episodes published more than 30 days ago for archiving', async () => {
		const { body } = await producer.api('/api/storage');
		const archive = body.channel.archive;
		expect(archive.afterDays).toBe(30);
		const listed = archive.list.map((e: any) => e.id);
		expect(listed).toContain(ids.archived);
		expect(listed).toContain(ids.plannedOnly);
		expect(listed).not.toContain(ids.recent); // 10 days < 30
		expect(listed).not.toContain(ids.axle); // not published
		const hinge = archive.list.find((e: any) => e.id === ids.archived);
		// Frees its 3 GB of rushes from the quota, and their 100 MB proxy on disk; the cut stays.
		expect(hinge.rushesBytes).toBe(3_000_000_000);
		expect(hinge.rushesMadeBytes).toBe(100_000_000);
		// 45 days ago, give or take the seconds the test took.
		const days = (Date.now() - Date.parse(hinge.publishedAt)) / 86_400_000;
		expect(days).toBeGreaterThan(44.9);
		expect(days).toBeLessThan(45.1);
		// Together: 3,000,000,000 + 1,000,000 = 3,001,000,000 more to free, in 2 more episodes.
		expect(archive.rushesBytes - before.channel.archive.rushesBytes).toBe(3_001_000_000);
		expect(archive.episodes - before.channel.archive.episodes).toBe(2);
	});

	test('pages episodes largest first with a keyset cursor', async () => {
		const all = (await producer.api('/api/storage?limit=200')).body;
		const order = all.episodes.map((e: any) => e.id);
		const totals = all.episodes.map((e: any) => e.totalBytes);
		expect(totals).toEqual([...totals].sort((a, b) => b - a));
		// 5,992,710,000 (axle) > 3,700,000,000 (hinge: 3 GB + 600 MB + 100 MB) > 2,000,000,000 (brake).
		expect(order.indexOf(ids.axle)).toBeLessThan(order.indexOf(ids.archived));
		expect(order.indexOf(ids.archived)).toBeLessThan(order.indexOf(ids.recent));
		// Walking pages of 2 with the cursor gives the same list, each episode once.
		const walked: string[] = [];
		let next: string | null = null;
		do {
			const query: string = next ? `&after=${encodeURIComponent(next)}` : '';
			const page: any = (await producer.api(`/api/storage?limit=2${query}`)).body;
			expect(page.episodes.length).toBeLessThanOrEqual(2);
			// The same scale on every page: the channel's largest episode.
			expect(page.largestBytes).toBe(totals[0]);
			walked.push(...page.episodes.map((e: any) => e.id));
			next = page.next;
		} while (next && walked.length <= order.length);
		expect(walked).toEqual(order);
		// The cursor after the hinge episode is its total and id; the next one follows it.
		const after = await producer.api(
			`/api/storage?limit=1&after=${encodeURIComponent(`3700000000_${ids.archived}`)}`
		);
		expect(after.body.episodes[0].id).toBe(order[order.indexOf(ids.archived) + 1]);
	});

	test('refuses a broken cursor or page size with a message on the field', async () => {
		for (const [query, field] of [
			['after=nonsense', 'after'],
			['after=12_not-a-uuid', 'after'],
			[`after=${'9'.repeat(30)}_${ids.axle}`, 'after'],
			['limit=0', 'limit'],
			['limit=abc', 'limit'],
			['limit=201', 'limit'],
			['limit=2.5', 'limit']
		]) {
			const { status, body } = await producer.api(`/api/storage?${query}`);
			expect(status, query).toBe(400);
			expect(body.issues[field]?.[0], query).toMatch(/\w/);
		}
	});
	test('hostile query strings get a 200 or a 400 with field messages, never a 5xx', async () => {
		// Seeded (OWASP ASVS 4.0.3 V5, input validation), as the route fuzz test does for every route.
		await fc.assert(
			fc.asyncProperty(hostileString, hostileString, async (after, limit) => {
				const query = new URLSearchParams({ after, limit }).toString();
				const { status, body } = await producer.api(`/api/storage?${query}`);
				const shown = query.slice(0, 120);
				// 431: a query string longer than Node's header limit is refused before the app sees it.
				expect([200, 400, 431], shown).toContain(status);
				if (status === 400) expect(Object.keys(body.issues).length, shown).toBeGreaterThan(0);
			}),
			{ seed: 13_2026, numRuns: 150 }
		);
	});

	test('counts against the quota what the Channel page says is in use', async () => {
		const { body } = await producer.api('/api/storage');
		const channelPage = await (
			await producer.request('/channel', { headers: { accept: 'text/html' } })
		).text();
		expect(channelPage).toContain(`In use now: ${formatBytes(body.channel.countedBytes)}`);
	});
});

describe('who may read it', () => {
	test('any crew member of the channel may read it', async () => {
		const host = await signedIn(demo.host);
		const { status, body } = await host.api('/api/storage');
		expect(status).toBe(200);
		expect(body.episodes.map((e: any) => e.id)).toContain(ids.axle);
	});

	test("another channel's producer sees only their own channel", async () => {
		const other = await signedIn(demo.otherProducer);
		const { status, body } = await other.api('/api/storage?limit=200');
		expect(status).toBe(200);
		const seen = JSON.stringify(body);
		for (const id of created) expect(seen).not.toContain(id);
		const [mine] = await sql(
			`SELECT coalesce(sum(f.size_bytes) FILTER (WHERE f.purpose = 'footage'), 0) AS rushes
			 FROM membership m JOIN person p ON p.id = m.person_id
			 JOIN channel c ON c.id = m.channel_id
			 LEFT JOIN footage f ON f.channel_id = c.id
			 WHERE p.email = $1 AND c.id <> $2
			 GROUP BY c.id`,
			[demo.otherProducer, channelId]
		);
		expect(body.channel.rushesBytes).toBe(Number(mine.rushes));
	});

	test('a signed-out caller gets 401 from the API and is sent to sign in from the page', async () => {
		const api = await fetch(`${baseUrl()}/api/storage`);
		expect(api.status).toBe(401);
		const page = await fetch(`${baseUrl()}/storage`, {
			redirect: 'manual',
			headers: { accept: 'text/html' }
		});
		expect(page.status).toBe(303);
		expect(page.headers.get('location')).toMatch(/^\/signin/);
	});
});

describe('the page', () => {
	test('draws the quota and each episode as bars with text alternatives', async () => {
		const response = await producer.request('/storage', { headers: { accept: 'text/html' } });
		expect(response.status).toBe(200);
		const html = await response.text();
		expect(html).toMatch(/role="img"[^>]*aria-label="Counted against the quota: [^"]+ of [^"]+"/);
		// formatBytes rounds to one decimal below 100 of a unit: 5,992,710,000 → "6.0 GB",
		// 242,710,000 → "243 MB" (NIST SP 811 §4 prefixes).
		expect(html).toContain(
			'aria-label="Storage test: long-bed axle swap: 6.0 GB in all. Rushes 4.0 GB, Cuts 750 MB, Uploads arriving 1.0 GB, Made files 243 MB."'
		);
		expect(html).toContain('published more than 30 days ago');
		expect(html).toContain('href="/storage"');
	});

	test('a broken "more" link shows the first page and says why, never an error', async () => {
		const response = await producer.request('/storage?after=%00%ff', {
			headers: { accept: 'text/html' }
		});
		expect(response.status).toBe(200);
		expect(await response.text()).toContain('That “more” link is not one this page made.');
	});
});
