/**
 * The episode list against one plain reference query: for every sort, both directions and the
 * filters, walking the API's pages gives exactly the rows, in exactly the order, that a
 * straightforward SQL query over the same tables gives (correlated subqueries for the counts and
 * lists, `ORDER BY … NULLS LAST/FIRST` for the order), with the same contents in each row. It pins
 * what the list answers while the list's own query is made cheaper at a real channel's size.
 *
 * Sources for the reference: PostgreSQL's documentation of ORDER BY (`NULLS FIRST`/`NULLS LAST`,
 * ties broken only by later keys) and of the aggregate functions (`count`, `sum`, `json_agg` with
 * its own ORDER BY). The list's rules (no publish date last going up and first going down; ties by
 * title, then id; stages in the order of the production line) are ours, from the README.
 *
 * The rows live in a channel of this file's own: 300 episodes whose titles differ only in case in
 * runs of three, whose dates and creation times tie in runs, with 0–5 segments, 0–2 crew and 0–2
 * builds each, and approved scripts both unchanged and changed since approval.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { demo, signedIn, sql, type Visitor } from '../helpers/http';

const EMAIL = 'list.reference@reference.test';
const EPISODES = 300;
/**
 * SHA-256 of no bytes at all (the well-known empty-input digest; from memory, and node:crypto's
 * createHash('sha256').digest('hex') gives the same): the fingerprint of a script without text.
 */
const EMPTY_SCRIPT_FINGERPRINT = 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855';

let channelId = '';
let producerId = '';
let hostId = '';
let producer: Visitor;

interface ListRow {
	id: string;
	title: string;
	stage: string;
	publishDate: string | null;
	scriptStatus: string;
	scriptShown: string;
	segmentCount: number;
	plannedSeconds: number;
	assignments: { role: string; personId: string; name: string }[];
	builds: { id: string; name: string }[];
}

beforeAll(async () => {
	[{ id: channelId }] = await sql<{ id: string }>(
		`INSERT INTO channel (name, frame_rate) VALUES ('Zz list reference bay', '29.97') RETURNING id`
	);
	[{ id: producerId }] = await sql<{ id: string }>(
		`INSERT INTO person (email, name, password_hash)
		 SELECT $1, 'Reference Producer', password_hash FROM person WHERE email = $2 RETURNING id`,
		[EMAIL, demo.producer]
	);
	[{ id: hostId }] = await sql<{ id: string }>(
		`INSERT INTO person (email, name) VALUES ('list.reference.host@reference.test', 'Reference Host') RETURNING id`
	);
	await sql(
		`INSERT INTO membership (channel_id, person_id, roles)
		 VALUES ($1, $2, ARRAY['producer']), ($1, $3, ARRAY['host'])`,
		[channelId, producerId, hostId]
	);
	await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage,
		   publish_date, created_at, script_status, script_approved_fingerprint)
		 SELECT $1,
		   (ARRAY['Bay day ', 'bay day ', 'BAY DAY '])[1 + i % 3] || (i / 3) % 41,
		   'list-reference-' || i, 600, '29.97',
		   (ARRAY['script','shoot','edit','locked','published'])[1 + i % 5],
		   CASE WHEN i % 7 = 0 THEN NULL ELSE DATE '2027-03-01' + (i % 13) END,
		   TIMESTAMPTZ '2026-11-01 08:00:00+00' + (i % 40) * INTERVAL '1 hour' + (i % 7) * INTERVAL '1 microsecond',
		   (ARRAY['draft','submitted','approved','returned'])[1 + i % 4],
		   CASE WHEN i % 8 = 2 THEN $2 WHEN i % 8 = 6 THEN 'a fingerprint of older text' END
		 FROM generate_series(1, ${EPISODES}) AS i`,
		[channelId, EMPTY_SCRIPT_FINGERPRINT]
	);
	await sql(
		`INSERT INTO segment (episode_id, position, kind, title, planned_seconds)
		 SELECT e.id, p, 'install-step', 'Step ' || p, 30 * p + (abs(hashtext(e.slug)) % 11)
		 FROM episode e, generate_series(1, 5) AS p
		 WHERE e.channel_id = $1 AND p <= abs(hashtext(e.slug)) % 6`,
		[channelId]
	);
	await sql(
		`INSERT INTO episode_assignment (episode_id, role, person_id)
		 SELECT e.id, 'host', $2::uuid FROM episode e WHERE e.channel_id = $1 AND abs(hashtext(e.slug)) % 2 = 0
		 UNION ALL
		 SELECT e.id, 'producer', $3::uuid FROM episode e WHERE e.channel_id = $1 AND abs(hashtext(e.slug)) % 3 = 0`,
		[channelId, hostId, producerId]
	);
	const builds = await sql<{ id: string }>(
		`INSERT INTO build (channel_id, name, year, vehicle_type, drivetrain, front_suspension,
		   rear_suspension, tyre_size)
		 SELECT $1, name, 2004, 'midsize pickup', '4x4', 'independent', 'leaf-sprung', '265/70R17'
		 FROM unnest(ARRAY['Reference hauler', 'Reference wagon', 'Reference crawler']) AS name
		 RETURNING id`,
		[channelId]
	);
	await sql(
		`INSERT INTO episode_build (episode_id, build_id)
		 SELECT e.id, b.id FROM episode e
		 JOIN unnest($2::uuid[]) WITH ORDINALITY AS b(id, n) ON abs(hashtext(e.slug || n)) % 3 = 0
		 WHERE e.channel_id = $1`,
		[channelId, builds.map((build) => build.id)]
	);
	producer = await signedIn(EMAIL);
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM build WHERE channel_id = $1`, [channelId]);
	await sql(`DELETE FROM person WHERE email LIKE 'list.reference%@reference.test'`);
});

const STAGE_POSITION = `CASE e.stage WHEN 'script' THEN 1 WHEN 'shoot' THEN 2 WHEN 'edit' THEN 3
  WHEN 'locked' THEN 4 WHEN 'published' THEN 5 END`;

/** The plain ORDER BY of each sort and direction (PostgreSQL docs: ORDER BY, NULLS FIRST/LAST). */
function referenceOrder(sort: string, direction: 'asc' | 'desc'): string {
	const dated = direction === 'asc' ? 'ASC NULLS LAST' : 'DESC NULLS FIRST';
	const tail = 'e.title ASC, e.id ASC';
	switch (sort) {
		case 'title':
			return `lower(e.title) ${direction}, ${tail}`;
		case 'stage':
			return `${STAGE_POSITION} ${direction}, e.publish_date ASC NULLS LAST, ${tail}`;
		case 'created':
			return `e.created_at ${direction}, ${tail}`;
		default:
			return `e.publish_date ${dated}, ${tail}`;
	}
}

interface Filters {
	stage?: string;
	assignee?: string;
	from?: string;
	to?: string;
}

/** Every row the list should give, in order, by one plain query with a subquery per column. */
async function reference(sort: string, direction: 'asc' | 'desc', filters: Filters = {}) {
	const conditions = ['e.channel_id = $1'];
	const params: unknown[] = [channelId];
	if (filters.stage) conditions.push(`e.stage = $${params.push(filters.stage)}`);
	if (filters.assignee)
		conditions.push(
			`e.id IN (SELECT episode_id FROM episode_assignment WHERE person_id = $${params.push(filters.assignee)})`
		);
	if (filters.from) conditions.push(`e.publish_date >= $${params.push(filters.from)}`);
	if (filters.to) conditions.push(`e.publish_date <= $${params.push(filters.to)}`);
	const rows = await sql<ListRow & { changed: boolean }>(
		`SELECT e.id, e.title, e.stage, e.publish_date::text AS "publishDate",
		   e.script_status AS "scriptStatus",
		   e.script_status = 'approved' AND e.script_approved_fingerprint IS DISTINCT FROM $${params.push(EMPTY_SCRIPT_FINGERPRINT)} AS changed,
		   (SELECT count(*)::int FROM segment s WHERE s.episode_id = e.id) AS "segmentCount",
		   (SELECT coalesce(sum(s.planned_seconds), 0)::int FROM segment s WHERE s.episode_id = e.id) AS "plannedSeconds",
		   (SELECT coalesce(json_agg(json_build_object('role', a.role, 'personId', p.id, 'name', p.name) ORDER BY a.role), '[]')
		      FROM episode_assignment a JOIN person p ON p.id = a.person_id WHERE a.episode_id = e.id) AS assignments,
		   (SELECT coalesce(json_agg(json_build_object('id', b.id, 'name', b.name) ORDER BY b.name), '[]')
		      FROM episode_build eb JOIN build b ON b.id = eb.build_id WHERE eb.episode_id = e.id) AS builds
		 FROM episode e WHERE ${conditions.join(' AND ')}
		 ORDER BY ${referenceOrder(sort, direction)}`,
		params
	);
	// The one rule of $lib/script/status.ts: approved and changed since reads as "changed".
	return rows.map(({ changed, ...row }) => ({
		...row,
		scriptShown: changed ? 'changed' : row.scriptStatus
	}));
}

/** Every page of `path`, `limit` at a time, following `next`; the rows with the fields compared. */
async function walk(path: string, limit: number): Promise<ListRow[]> {
	const rows: ListRow[] = [];
	let next: string | null = null;
	let pages = 0;
	do {
		const answer = await producer.api(
			`${path}&limit=${limit}${next ? `&after=${encodeURIComponent(next)}` : ''}`
		);
		expect(answer.status, JSON.stringify(answer.body)).toBe(200);
		for (const item of answer.body.items as ListRow[])
			rows.push({
				id: item.id,
				title: item.title,
				stage: item.stage,
				publishDate: item.publishDate,
				scriptStatus: item.scriptStatus,
				scriptShown: item.scriptShown,
				segmentCount: item.segmentCount,
				plannedSeconds: item.plannedSeconds,
				assignments: item.assignments,
				builds: item.builds
			});
		next = answer.body.next;
		expect(++pages).toBeLessThan(100);
	} while (next);
	return rows;
}

const ORDERS = ['publish', 'title', 'stage', 'created'].flatMap((sort) =>
	(['asc', 'desc'] as const).map((direction) => ({ sort, direction }))
);

describe('the episode list against a plain reference query', () => {
	test('the channel holds what this file made, with every kind of row', async () => {
		const all = await reference('publish', 'asc');
		expect(all).toHaveLength(EPISODES);
		expect(all.some((row) => row.publishDate === null)).toBe(true);
		expect(all.some((row) => row.scriptShown === 'changed')).toBe(true);
		expect(all.some((row) => row.scriptShown === 'approved')).toBe(true);
		expect(all.some((row) => row.segmentCount === 0)).toBe(true);
		expect(all.some((row) => row.builds.length >= 2)).toBe(true);
		expect(all.some((row) => row.assignments.length === 2)).toBe(true);
	});

	test.each(ORDERS)(
		'sorted by $sort $direction, pages of 23 give the reference rows in the reference order',
		async ({ sort, direction }) => {
			const expected = await reference(sort, direction);
			expect(await walk(`/api/episodes?sort=${sort}&direction=${direction}`, 23)).toEqual(expected);
		}
	);

	test.each<{ sort: string; direction: 'asc' | 'desc'; filters: Record<string, string> }>([
		{ sort: 'publish', direction: 'asc', filters: { stage: 'edit' } },
		{ sort: 'title', direction: 'desc', filters: { stage: 'shoot' } },
		{ sort: 'stage', direction: 'desc', filters: { from: '2027-03-04', to: '2027-03-09' } },
		{ sort: 'created', direction: 'asc', filters: { from: '2027-03-10' } },
		{ sort: 'publish', direction: 'desc', filters: { to: '2027-03-03' } }
	])(
		'filtered by $filters and sorted by $sort $direction, the pages match the reference',
		async ({ sort, direction, filters }) => {
			const expected = await reference(sort, direction, filters);
			expect(expected.length).toBeGreaterThan(20);
			const query = new URLSearchParams({ sort, direction, ...filters });
			expect(await walk(`/api/episodes?${query}`, 23)).toEqual(expected);
		}
	);

	test.each(['publish', 'stage', 'title', 'created'])(
		'filtered by the assigned host and sorted by %s, the pages match the reference',
		async (sort) => {
			const expected = await reference(sort, 'desc', { assignee: hostId });
			expect(expected.length).toBeGreaterThan(20);
			const query = new URLSearchParams({ sort, direction: 'desc', assignee: hostId });
			expect(await walk(`/api/episodes?${query}`, 23)).toEqual(expected);
		}
	);

	test('the page /episodes lists the reference’s first 50 rows in order', async () => {
		const expected = await reference('title', 'desc');
		const html = await (
			await producer.request('/episodes?sort=title&direction=desc', {
				headers: { accept: 'text/html' }
			})
		).text();
		const shown = [...html.matchAll(/href="\/episodes\/([0-9a-f-]{36})"/g)].map((m) => m[1]);
		expect(shown).toEqual(expected.slice(0, 50).map((row) => row.id));
	});
});
