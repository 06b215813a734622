/**
 * The publish kit and tracked links over HTTP against the built server: the demo's published
 * episode's kit checked line by line, its three formats, missing chapters said in the kit, the
 * character count, the kit in one query; the /go/ redirect with its campaign parameters, clicks
 * counted per day (HEAD, crawlers and scripts not counted), no personal data, and the clicks table.
 *
 * Outside sources for the checks:
 * - Chapter lines: description timestamps (common practice of video platforms, from memory:
 *   first at 0:00, M:SS cut off to the second), times from frame counts at the exact rate
 *   30000/1001 (tests/REFERENCES.md, "Frame rates"), computed here in integers.
 * - Redirects: RFC 9110 §15.4.3 (302 Found with Location); HEAD answers as GET would, without
 *   a body (RFC 9110 §9.3.2).
 * - Who is a bot: the `isbot` npm package's pattern list is the reference; the browser strings are
 *   the shape every desktop and phone browser sends (RFC 9110 §10.1.5 User-Agent), written from
 *   memory, and the crawler string is invented in the usual "compatible; Name/1.0; +url" shape.
 * - URLs: the WHATWG URL Standard (Node's `URL` and `URLSearchParams`) reads the Location back.
 * - Campaign parameter names utm_source, utm_medium, utm_campaign, utm_content: common practice
 *   of web analytics tools (from memory).
 * - Safety wording: the product owner's rule that hazardous work defers to manufacturer
 *   instructions, local codes and licensed professionals.
 */
import { CamelCasePlugin, Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { Visitor, baseUrl, demo, signedIn, sql } from '../helpers/http';
import { publishKitFor } from '$lib/server/merch/publish-kit';
import type { Database } from '$lib/server/db/types';

let channelId: string;
let merch: Visitor;
let producer: Visitor;
let tallboy: { id: string; slug: string; logline: string; cut_duration_frames: number };

/** M:SS (H:MM:SS from an hour) of a frame count at 29.97, cut off to the second, in integers. */
function clockOf(frames: number): string {
	const milliseconds = Number((2n * BigInt(frames) * 1001n * 1000n + 30000n) / 60000n); // round(frames × 1001000 / 30000)
	const seconds = Math.floor(milliseconds / 1000);
	const [h, m, s] = [Math.floor(seconds / 3600), Math.floor(seconds / 60) % 60, seconds % 60];
	return h > 0
		? `${h}:${String(m).padStart(2, '0')}:${String(s).padStart(2, '0')}`
		: `${m}:${String(s).padStart(2, '0')}`;
}

const today = () => new Date().toISOString().slice(0, 10);
const clicksToday = async (code: string) =>
	Number(
		(
			await sql(
				`SELECT coalesce(sum(d.clicks), 0)::int AS n FROM link_click_day d JOIN tracked_link l ON l.id = d.link_id WHERE l.code = $1 AND d.day = $2::date`,
				[code, today()]
			)
		)[0].n
	);

beforeAll(async () => {
	channelId = (await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`))[0].id;
	merch = await signedIn(demo.merch);
	producer = await signedIn(demo.producer);
	[tallboy] = await sql(
		`SELECT id, slug, logline, cut_duration_frames FROM episode WHERE slug = 'tallboy-coil-spacers'`
	);
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE slug LIKE 'kit-test-%'`);
	await sql(`DELETE FROM part WHERE sku LIKE 'KIT-TEST-%'`);
});

describe('the publish kit of the published demo episode', () => {
	test('line by line: logline, chapters, parts with times and links, safety, call to action', async () => {
		const answer = await merch.api(`/api/episodes/${tallboy.id}/publish-kit?format=txt`);
		expect(answer.status).toBe(200);
		expect(answer.headers.get('content-type')).toBe('text/plain; charset=utf-8');
		const lines = String(answer.body).replace(/\n$/, '').split('\n');

		const chapters = await sql<{ start_frame: number; title: string }>(
			`SELECT start_frame, title FROM chapter WHERE episode_id = $1 ORDER BY start_frame`,
			[tallboy.id]
		);
		const featured = await sql<{
			sku: string;
			name: string;
			brand: string;
			code: string;
			frames: number[];
		}>(
			`SELECT p.sku, p.name, p.brand, l.code, array_agg(n.program_frame ORDER BY n.program_frame) AS frames
			 FROM segment_note_part snp JOIN segment_note n ON n.id = snp.note_id JOIN part p ON p.id = snp.part_id
			 JOIN tracked_link l ON l.part_id = p.id AND l.episode_id = n.episode_id
			 WHERE n.episode_id = $1 GROUP BY p.sku, p.name, p.brand, l.code ORDER BY min(n.program_frame), p.sku`,
			[tallboy.id]
		);
		const cautions = await sql<{ text: string }>(
			`SELECT c.text FROM caution c JOIN segment s ON s.id = c.segment_id WHERE s.episode_id = $1 ORDER BY c.at_frame, s.position, c.hazard`,
			[tallboy.id]
		);
		const [channel] = await sql(
			`SELECT call_to_action, contact, disclosure FROM channel WHERE id = $1`,
			[channelId]
		);
		const origin = baseUrl();

		const expected = [
			tallboy.logline,
			'',
			'Chapters',
			...chapters.map((chapter) => `${clockOf(chapter.start_frame)} ${chapter.title}`),
			'',
			'Parts in this episode',
			// The disclosure comes before the links, so it is read before a click (common practice).
			channel.disclosure,
			...featured.map(
				(part) =>
					`- ${part.name} (${part.brand}, ${part.sku}), at ${[...new Set(part.frames.map(clockOf))].join(', ')}: ${origin}/go/${part.code}`
			),
			'',
			'Safety',
			...[...new Set(cautions.map((caution) => caution.text))].map((text) => `- ${text}`)
		];
		expect(lines.slice(0, expected.length)).toEqual(expected);
		expect(lines[3]).toMatch(/^0:00 /);
		// The first part on screen is the coil spacer at 0:52 (the demo's first placed note).
		expect(lines[expected.indexOf('Parts in this episode') + 2]).toMatch(
			/^- Coil spacer pair, 1\.5 in, polyurethane \(Kingbolt Suspension, KBS-CS-150\), at 0:52, 3:10, 7:02: http/
		);

		const rest = lines.slice(expected.length);
		// The general safety note defers to the manufacturer, local codes and licensed professionals.
		expect(rest[0]).toMatch(/manufacturer's instructions/);
		expect(rest[0]).toMatch(/local codes/);
		expect(rest[0]).toMatch(/licensed professional/);
		// Tallboy is lifted 1.5 in, so the road-legality note follows.
		expect(rest[1]).toMatch(/road-legal/);
		expect(rest.slice(2)).toEqual(['', channel.call_to_action, channel.contact]);
	});

	test('every part link in the kit redirects to that part’s store page', async () => {
		const kit = (await merch.api(`/api/episodes/${tallboy.id}/publish-kit`)).body;
		const partLines = kit.blocks
			.find((block: { id: string }) => block.id === 'parts')
			.text.split('\n')
			.slice(2) as string[]; // the title, then the disclosure
		expect(partLines.length).toBe(5);
		for (const line of partLines) {
			const address = line.slice(line.lastIndexOf(': ') + 2);
			const sku = /, ([A-Z0-9-]+)\)/.exec(line)![1];
			const response = await fetch(address, { method: 'HEAD', redirect: 'manual' });
			expect(response.status).toBe(302);
			const [part] = await sql(`SELECT store_url FROM part WHERE channel_id = $1 AND sku = $2`, [
				channelId,
				sku
			]);
			const target = new URL(response.headers.get('location')!);
			expect(`${target.origin}${target.pathname}`).toBe(
				new URL(part.store_url).origin + new URL(part.store_url).pathname
			);
			expect(target.searchParams.get('utm_content')).toBe(sku);
		}
	});

	test('md, txt and json say the same; the count is of code points against the channel’s limit', async () => {
		const kit = (await merch.api(`/api/episodes/${tallboy.id}/publish-kit`)).body;
		expect(kit.characters).toBe([...kit.text].length);
		expect(kit.limit).toBe(5000);
		expect(kit.overLimit).toBe(false);
		const txt = await merch.request(`/api/episodes/${tallboy.id}/publish-kit?format=txt`);
		expect(txt.headers.get('content-disposition')).toBe(
			'attachment; filename="tallboy-coil-spacers-publish-kit.txt"'
		);
		expect(await txt.text()).toBe(`${kit.text}\n`);
		const md = await (
			await merch.request(`/api/episodes/${tallboy.id}/publish-kit?format=md`)
		).text();
		expect(md.split('\n')[0]).toBe('# Coil spacer lift on Project Tallboy');
		expect(md).toContain('## Parts in this episode');
		expect(md).toMatch(
			/- \[Coil spacer pair, 1\.5 in, polyurethane\]\(http:\/\/127\.0\.0\.1:\d+\/go\/[A-Za-z0-9]{8}\) \(Kingbolt Suspension, KBS-CS-150\), at 0:52, 3:10, 7:02/
		);
		const json = JSON.parse(
			await (await merch.request(`/api/episodes/${tallboy.id}/publish-kit?format=json`)).text()
		);
		expect(json.text).toBe(kit.text);
		expect((await merch.api(`/api/episodes/${tallboy.id}/publish-kit?format=pdf`)).status).toBe(
			400
		);
	});

	test('a description over the channel’s limit is flagged', async () => {
		const [{ description_limit: limit }] = await sql(
			`SELECT description_limit FROM channel WHERE id = $1`,
			[channelId]
		);
		await sql(`UPDATE channel SET description_limit = 200 WHERE id = $1`, [channelId]);
		try {
			const kit = (await merch.api(`/api/episodes/${tallboy.id}/publish-kit`)).body;
			expect(kit).toMatchObject({ limit: 200, overLimit: true });
			expect(kit.characters).toBeGreaterThan(200);
		} finally {
			await sql(`UPDATE channel SET description_limit = $2 WHERE id = $1`, [channelId, limit]);
		}
	});

	test('the whole kit is read in one query', async () => {
		let queries = 0;
		const executor = new Kysely<Database>({
			dialect: new PostgresDialect({
				pool: new pg.Pool({ connectionString: inject('databaseUrl'), max: 1 })
			}),
			plugins: [new CamelCasePlugin()],
			log: (event) => {
				if (event.level === 'query') queries++;
			}
		});
		try {
			const kit = await publishKitFor(
				channelId,
				tallboy.id,
				{ origin: 'https://wrenchroll.example' },
				executor
			);
			expect(kit.blocks.map((block) => block.id)).toEqual([
				'logline',
				'chapters',
				'parts',
				'safety',
				'call-to-action'
			]);
			expect(queries).toBe(1);
		} finally {
			await executor.destroy();
		}
	});
});

describe('a kit with pieces missing says so instead of failing', () => {
	test('no chapters, too few chapters, no parts, no logline', async () => {
		const [episode] = await sql(
			`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames) VALUES ($1, 'Kit test', $2, 600, '29.97', 'edit', 17982) RETURNING id`,
			[channelId, `kit-test-${Date.now()}`]
		);
		const first = (await merch.api(`/api/episodes/${episode.id}/publish-kit`)).body;
		const block = (id: string) => first.blocks.find((b: { id: string }) => b.id === id);
		expect(first.text.split('\n').slice(0, 2)).toEqual([
			'Chapters',
			'[Chapters not ready: There are no chapters yet: the editor marks them on the edit timeline. Fix them on the edit timeline.]'
		]);
		expect(block('logline').problems[0]).toMatch(/no logline/);
		expect(block('parts')).toMatchObject({ text: '' });
		await sql(
			`INSERT INTO chapter (episode_id, start_frame, title) VALUES ($1, 0, 'Cold open'), ($1, 3000, 'Lift')`,
			[episode.id]
		);
		const second = (await merch.api(`/api/episodes/${episode.id}/publish-kit`)).body;
		expect(second.blocks[1].problems).toEqual([
			'A chapter list needs at least 3 chapters; this one has 2.'
		]);
		expect(second.text).toContain(
			'[Chapters not ready: A chapter list needs at least 3 chapters; this one has 2. Fix them on the edit timeline.]'
		);
	});
});

describe('tracked links', () => {
	async function linkedEpisode(storeUrl: string) {
		const [episode] = await sql(
			`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage) VALUES ($1, 'Kit test links', $2, 600, '29.97', 'edit') RETURNING id, slug`,
			[channelId, `kit-test-links-${Date.now()}`]
		);
		const [part] = await sql(
			`INSERT INTO part (channel_id, sku, name, category, brand, price_cents, store_url) VALUES ($1, $2, 'Kit test part', 'Test', 'Test', 100, $3) RETURNING id, sku`,
			[channelId, `KIT-TEST-${Date.now()}`, storeUrl]
		);
		const camera = await signedIn(demo.camera);
		const note = (
			await camera.api(`/api/episodes/${episode.id}/notes`, {
				method: 'POST',
				json: { text: 'Part on the bench' }
			})
		).body.note;
		const linked = await merch.api(`/api/notes/${note.id}`, {
			method: 'PATCH',
			json: { version: note.version, partIds: [part.id] }
		});
		expect(linked.status).toBe(200);
		const [link] = await sql(
			`SELECT code FROM tracked_link WHERE episode_id = $1 AND part_id = $2`,
			[episode.id, part.id]
		);
		return { episode, part, code: link.code as string };
	}

	test('GET redirects 302 with the campaign parameters; the store’s own query and fragment stay as written', async () => {
		const storeUrl = 'https://shop.torquehaven.test/p/kit?size=33x12.50R15&note=a%20b&flag#fitment';
		const { episode, part, code } = await linkedEpisode(storeUrl);
		const response = await fetch(`${baseUrl()}/go/${code}`, { redirect: 'manual' });
		expect(response.status).toBe(302);
		expect(response.headers.get('cache-control')).toBe('no-store');
		const location = response.headers.get('location')!;
		expect(
			location.startsWith(
				'https://shop.torquehaven.test/p/kit?size=33x12.50R15&note=a%20b&flag&utm_source='
			)
		).toBe(true);
		expect(location.endsWith('#fitment')).toBe(true);
		const target = new URL(location);
		expect(Object.fromEntries(target.searchParams)).toEqual({
			size: '33x12.50R15',
			note: 'a b',
			flag: '',
			utm_source: 'torquehaven-garage',
			utm_medium: 'video',
			utm_campaign: episode.slug,
			utm_content: part.sku
		});
	});

	const desktop =
		'Mozilla/5.0 (X11; Linux x86_64) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/156.0.0.0 Safari/537.36';
	const phone =
		'Mozilla/5.0 (iPhone; CPU iPhone OS 17_0 like Mac OS X) AppleWebKit/605.1.15 (KHTML, like Gecko) Version/17.0 Mobile/15E148 Safari/604.1';
	const follow = (code: string, init: RequestInit = {}, agent: string | null = desktop) =>
		fetch(`${baseUrl()}/go/${code}`, {
			redirect: 'manual',
			...init,
			headers: agent === null ? {} : { 'user-agent': agent }
		});

	test('each GET from a browser counts one click today (also twenty at once); HEAD answers the same and counts none', async () => {
		const { code } = await linkedEpisode('https://shop.torquehaven.test/p/count');
		expect(await clicksToday(code)).toBe(0);
		const head = await follow(code, { method: 'HEAD' });
		expect(head.status).toBe(302);
		expect(head.headers.get('location')).toMatch(
			/^https:\/\/shop\.torquehaven\.test\/p\/count\?utm_source=/
		);
		expect(await clicksToday(code)).toBe(0);
		expect((await follow(code)).status).toBe(302);
		expect(await clicksToday(code)).toBe(1);
		await Promise.all(
			Array.from({ length: 20 }, (_, i) => follow(code, {}, i % 2 ? phone : desktop))
		);
		expect(await clicksToday(code)).toBe(21);
		// One row per link and day, whatever the number of clicks.
		expect(
			await sql(
				`SELECT day FROM link_click_day d JOIN tracked_link l ON l.id = d.link_id WHERE l.code = $1`,
				[code]
			)
		).toHaveLength(1);
	});

	test('crawlers, link previews and scripts are sent on to the store but not counted', async () => {
		const { code } = await linkedEpisode('https://shop.torquehaven.test/p/bots');
		const agents = [
			'Mozilla/5.0 (compatible; ExampleCrawler/1.0; +http://example.test/bot.html)',
			'curl/8.5.0',
			'node',
			null
		];
		for (const agent of agents) {
			const response = await follow(code, {}, agent);
			expect(response.status, String(agent)).toBe(302);
			expect(response.headers.get('location'), String(agent)).toMatch(
				/^https:\/\/shop\.torquehaven\.test\/p\/bots\?utm_source=/
			);
		}
		expect(await clicksToday(code)).toBe(0);
		expect((await follow(code, {}, phone)).status).toBe(302);
		expect(await clicksToday(code)).toBe(1);
	});

	test('an unknown or malformed code is 404, for GET and HEAD, and nothing is counted', async () => {
		const before = (await sql(`SELECT coalesce(sum(clicks), 0)::int AS n FROM link_click_day`))[0]
			.n;
		for (const code of ['Zz9Zz9Zz', 'no', '..%2F..%2Fapi', 'a'.repeat(40)]) {
			expect((await fetch(`${baseUrl()}/go/${code}`, { redirect: 'manual' })).status, code).toBe(
				404
			);
			expect(
				(await fetch(`${baseUrl()}/go/${code}`, { method: 'HEAD', redirect: 'manual' })).status,
				code
			).toBe(404);
		}
		expect((await sql(`SELECT coalesce(sum(clicks), 0)::int AS n FROM link_click_day`))[0].n).toBe(
			before
		);
	});

	test('no personal data: the click table holds a link, a day and a count, nothing else', async () => {
		const columns = async (table: string) =>
			(
				await sql(
					`SELECT column_name FROM information_schema.columns WHERE table_name = $1 ORDER BY ordinal_position`,
					[table]
				)
			).map((row) => row.column_name);
		expect(await columns('link_click_day')).toEqual(['link_id', 'day', 'clicks']);
		expect(await columns('tracked_link')).toEqual([
			'id',
			'code',
			'episode_id',
			'part_id',
			'created_at'
		]);
	});

	test('the clicks table: every link of the episode, per day for 30 days, totals that add up', async () => {
		const answer = await merch.api(`/api/episodes/${tallboy.id}/clicks`);
		expect(answer.status).toBe(200);
		expect(answer.body.days).toHaveLength(30);
		expect(answer.body.to).toBe(today());
		const [{ n: stored }] = await sql(
			`SELECT coalesce(sum(d.clicks), 0)::int AS n FROM link_click_day d JOIN tracked_link l ON l.id = d.link_id WHERE l.episode_id = $1 AND d.day > (now() AT TIME ZONE 'UTC')::date - 30`,
			[tallboy.id]
		);
		expect(answer.body.total).toBe(stored);
		expect(answer.body.total).toBeGreaterThan(0);
		expect(answer.body.links).toHaveLength(5);
		for (const link of answer.body.links)
			expect(link.total).toBe(
				link.days.reduce((sum: number, day: { clicks: number }) => sum + day.clicks, 0)
			);
		expect(
			answer.body.days
				.map((day: { clicks: number }) => day.clicks)
				.reduce((a: number, b: number) => a + b, 0)
		).toBe(answer.body.total);
		expect((await producer.api(`/api/episodes/${tallboy.id}/clicks?days=0`)).status).toBe(400);
		expect(
			(await (await signedIn(demo.otherProducer)).api(`/api/episodes/${tallboy.id}/clicks`)).status
		).toBe(404);
	});
});
