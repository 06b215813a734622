/**
 * Parts benchmark (not a test): catalogue search over 20,000 parts and the publish kit of a big
 * episode, measured on this machine. Prints a table and exits 1 when a target is missed.
 *
 *   npm run build && node_modules/.bin/tsx scripts/bench-parts.ts
 *   (WRENCHROLL_BUILD_DIR picks another build folder, as for the tests)
 *
 * It starts its own throwaway PostgreSQL on a free loopback port (with pg_stat_statements loaded,
 * to count queries), runs the real migrate and seed scripts, adds 20,000 parts, starts the built
 * server, signs in as the demo merch team and then:
 * 1. runs 200 catalogue searches of varied kinds (words, SKU prefixes, filters, sorts, deep pages)
 *    after 30 warm-up ones, and prints the median and p95 per kind and overall. "API time" is the
 *    whole HTTP request on loopback, sign-in hooks included; the route's Server-Timing `total`
 *    (time inside the handler) is shown beside it. Target: median API time under 15 ms.
 * 2. builds an episode with 200 segment notes showing 100 parts, 12 chapters and 10 caution cards,
 *    asks for its publish kit 50 times and counts the statements with pg_stat_statements (reset
 *    just before): statements reading the kit's tables, per request. Target: one or two queries.
 */
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import {
	openBenchWorld,
	signedInSession as signIn,
	type BenchSession as Session
} from './lib/bench-world.ts';
import { percentile } from './lib/percentile.ts';

const CATALOGUE_PARTS = 20_000;
const WARM_UP_SEARCHES = 30;
const MEASURED_SEARCHES = 200;
const SEARCH_TARGET_MS = 15;
const KIT_NOTES = 200;
const KIT_PARTS = 100;
const KIT_REQUESTS = 50;
const KIT_QUERY_TARGET = 2;

const ms = (value: number) => `${value.toFixed(2)} ms`;

function serverTiming(header: string | null): number {
	const match = /(?:^|,)\s*total;dur=([0-9.]+)/.exec(header ?? '');
	if (!match) throw new Error(`no Server-Timing total in ${header ?? 'none'}`);
	return Number(match[1]);
}

// ---------------------------------------------------------------- the world

// ---------------------------------------------------------------- data

/** 20,000 parts of fictional brands, varied enough that words, SKUs and filters select differently. */
async function addCatalogue(pool: pg.Pool, channelId: string) {
	await pool.query(
		`INSERT INTO part (channel_id, sku, name, category, brand, price_cents, currency, store_url, fitment_note, status)
		 SELECT $1,
		   'BN-' || (ARRAY['LB','CS','SS','UB','SHK','AAL','BL','TB','PA','SBL'])[1 + i % 10] || '-' || lpad(i::text, 5, '0'),
		   (ARRAY['Lift block pair','Coil spacer pair','Strut spacer pair','U-bolt kit','Shackle pair','Add-a-leaf','Brake line set','Track bar','Pitman arm','Sway bar link pair'])[1 + i % 10]
		     || ', ' || (1 + i % 6) || ' in, ' || (ARRAY['cast','forged','polyurethane','aluminium','steel','zinc plated','heavy duty'])[1 + (i / 10) % 7] || ' ' || i,
		   (ARRAY['Lift blocks','Coil spacers','Strut spacers','U-bolts','Shackles','Leaf springs','Brake lines','Steering','Steering','Sway bars'])[1 + i % 10],
		   (ARRAY['Kingbolt Suspension','Quillon Shocks','Halvard Wheel Co.','Cindertrack Tyres','Northpine Brake Works','Cobalt Steer','Ashgrove Axle Works','Tallow Ridge Offroad','Mirefield Fabrication','Kestrelmark Lift','Brackwater Gear','Saltmarsh Steelworks'])[1 + (i / 7) % 12],
		   1000 + (i * 7919) % 90000, 'USD', 'https://shop.bench.test/p/' || i || '?ref=bench', '',
		   CASE WHEN i % 50 = 0 THEN 'discontinued' WHEN i % 20 = 0 THEN 'out_of_stock' ELSE 'active' END
		 FROM generate_series(1, ${CATALOGUE_PARTS}) AS i`,
		[channelId]
	);
	await pool.query('ANALYZE part');
}

/** Searches of every kind the catalogue page makes, in a fixed order so runs compare. */
function searchMix(): { kind: string; query: string }[] {
	const words = [
		'coil',
		'spacer pair',
		'forged 3 in',
		'quillon',
		'polyurethane 4',
		'brake line steel',
		'track bar heavy',
		'kestrelmark',
		'zinc plated u-bolt',
		'pitman'
	];
	const skus = ['BN-LB', 'BN-CS-01', 'BN-SHK-1999', 'BN-TB-0', 'KBS-LB', 'BN-AAL-12'];
	const mix: { kind: string; query: string }[] = [];
	for (let index = 0; mix.length < WARM_UP_SEARCHES + MEASURED_SEARCHES; index++) {
		const word = words[index % words.length];
		const sku = skus[index % skus.length];
		const variants = [
			{
				kind: 'whole catalogue, sorted',
				query: `sort=${['sku', 'name', 'brand', 'price', 'category'][index % 5]}&dir=${index % 2 ? 'desc' : 'asc'}&page=${1 + (index % 40)}`
			},
			{ kind: 'words', query: `q=${encodeURIComponent(word)}` },
			{ kind: 'SKU prefix', query: `q=${encodeURIComponent(sku)}` },
			{
				kind: 'words + filters + sort',
				query: `q=${encodeURIComponent(word.split(' ')[0])}&status=active&sort=price&dir=desc`
			},
			{
				kind: 'category filter, deep page',
				query: `category=Steering&sort=name&page=${1 + (index % 60)}&pageSize=25`
			},
			{ kind: 'no match', query: `q=${encodeURIComponent(`nothing-like-this-${index}`)}` }
		];
		mix.push(variants[index % variants.length]);
	}
	return mix;
}

/** An hour-long episode: 12 chapters, 10 segments with a caution each, 200 notes showing 100 parts. */
async function bigEpisode(pool: pg.Pool, channelId: string): Promise<string> {
	// 1 h at 29.97: 107892 frames (SMPTE ST 12-1; tests/REFERENCES.md, "Timecode").
	const [{ id }] = (
		await pool.query(
			`INSERT INTO episode (channel_id, title, slug, logline, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
			 VALUES ($1, 'Bench: a big install', 'bench-big-install', 'An hour in the bay with two hundred notes.', 3600, '29.97', 'edit', 107892) RETURNING id`,
			[channelId]
		)
	).rows;
	await pool.query(
		`INSERT INTO chapter (episode_id, start_frame, title) SELECT $1, (i * 8991), 'Chapter ' || (i + 1) FROM generate_series(0, 11) AS i`,
		[id]
	);
	await pool.query(
		`INSERT INTO segment (episode_id, position, kind, title, hazards) SELECT $1, i, 'install-step', 'Step ' || i, ARRAY['raised-vehicle'] FROM generate_series(1, 10) AS i`,
		[id]
	);
	// About 1,500 characters of script per segment, naming a few catalogue parts by SKU.
	await pool.query(
		`INSERT INTO segment_script (segment_id, body)
		 SELECT s.id, repeat('Lower the axle onto the stands, check the pinion angle and torque the nuts in a cross pattern. ', 15) || ' Fit the BN-LB-' || lpad((s.position * 10)::text, 5, '0') || ' block.'
		 FROM segment s WHERE s.episode_id = $1`,
		[id]
	);
	await pool.query(
		`INSERT INTO caution (segment_id, hazard, text, at_frame) SELECT s.id, 'raised-vehicle', 'Rated stands on level ground, step ' || s.position || '.', s.position * 9000 FROM segment s WHERE s.episode_id = $1`,
		[id]
	);
	await pool.query(
		`INSERT INTO segment_note (episode_id, segment_id, program_frame, text)
		 SELECT $1, (SELECT s.id FROM segment s WHERE s.episode_id = $1 AND s.position = 1 + i % 10), i * 500, 'Note ' || i || ': parts on the bench'
		 FROM generate_series(1, ${KIT_NOTES}) AS i`,
		[id]
	);
	const parts = (
		await pool.query(
			`SELECT id FROM part WHERE channel_id = $1 AND sku LIKE 'BN-%' AND status = 'active' ORDER BY sku LIMIT ${KIT_PARTS}`,
			[channelId]
		)
	).rows.map((row) => row.id as string);
	const notes = (
		await pool.query(`SELECT id FROM segment_note WHERE episode_id = $1 ORDER BY program_frame`, [
			id
		])
	).rows.map((row) => row.id as string);
	// Each note shows two parts, so every one of the 100 parts appears on four notes.
	const links = notes.flatMap((noteId, index) =>
		[parts[index % KIT_PARTS], parts[(index + 50) % KIT_PARTS]].map((partId) => [noteId, partId])
	);
	await pool.query(
		`INSERT INTO segment_note_part (note_id, part_id) SELECT * FROM unnest($1::uuid[], $2::uuid[])`,
		[links.map((link) => link[0]), links.map((link) => link[1])]
	);
	const alphabet = 'ABCDEFGHJKLMNPQRSTUVWXYZabcdefghijkmnopqrstuvwxyz23456789';
	const codes = parts.map(() =>
		Array.from(randomBytes(8), (byte) => alphabet[byte % alphabet.length]).join('')
	);
	await pool.query(
		`INSERT INTO tracked_link (episode_id, part_id, code) SELECT $1, * FROM unnest($2::uuid[], $3::text[])`,
		[id, parts, codes]
	);
	return id;
}

// ---------------------------------------------------------------- printing

function printTable(title: string, target: string, rows: Record<string, string>[]) {
	const columns = Object.keys(rows[0] ?? {});
	const widths = columns.map((column) =>
		Math.max(column.length, ...rows.map((row) => row[column].length))
	);
	const line = (cells: string[]) =>
		cells
			.map((cell, index) =>
				index === 0 ? cell.padEnd(widths[index]) : cell.padStart(widths[index])
			)
			.join('  ');
	console.log(`\n${title}\ntarget: ${target}\n`);
	console.log(line(columns));
	console.log(widths.map((width) => '─'.repeat(width)).join('  '));
	for (const row of rows) console.log(line(columns.map((column) => row[column])));
}

// ---------------------------------------------------------------- the benches

async function searchBench(session: Session): Promise<boolean> {
	const mix = searchMix();
	for (const { query } of mix.slice(0, WARM_UP_SEARCHES)) await session.get(`/api/parts?${query}`);
	const byKind = new Map<string, { wall: number[]; server: number[]; matches: number[] }>();
	const wall: number[] = [];
	const server: number[] = [];
	for (const { kind, query } of mix.slice(WARM_UP_SEARCHES)) {
		const answer = await session.get(`/api/parts?${query}`);
		if (answer.status !== 200)
			throw new Error(`search ${query} answered ${answer.status}: ${answer.body.slice(0, 200)}`);
		const samples = byKind.get(kind) ?? { wall: [], server: [], matches: [] };
		samples.wall.push(answer.wallMilliseconds);
		samples.server.push(serverTiming(answer.headers.get('server-timing')));
		samples.matches.push(JSON.parse(answer.body).total);
		byKind.set(kind, samples);
		wall.push(answer.wallMilliseconds);
		server.push(serverTiming(answer.headers.get('server-timing')));
	}
	const row = (label: string, samples: { wall: number[]; server: number[] }, matches: string) => ({
		'': label,
		searches: String(samples.wall.length),
		matches,
		'API median': ms(percentile(samples.wall, 0.5)),
		'API p95': ms(percentile(samples.wall, 0.95)),
		'handler median': ms(percentile(samples.server, 0.5)),
		'handler p95': ms(percentile(samples.server, 0.95))
	});
	const rows = [...byKind].map(([kind, samples]) =>
		row(kind, samples, `${Math.min(...samples.matches)}–${Math.max(...samples.matches)}`)
	);
	rows.push(row('all searches', { wall, server }, ''));
	const median = percentile(wall, 0.5);
	printTable(
		`Catalogue search, ${(CATALOGUE_PARTS + 34).toLocaleString('en')} parts, ${MEASURED_SEARCHES} searches after ${WARM_UP_SEARCHES} warm-up (25 a page)`,
		`median API time under ${SEARCH_TARGET_MS} ms`,
		rows
	);
	console.log(
		`\n• API time: the whole GET /api/parts on loopback from this script, session lookup included. Handler: the route's Server-Timing "total" (the page and the count queries, run side by side).`
	);
	console.log(
		`• Median API time ${ms(median)}: ${median < SEARCH_TARGET_MS ? 'target met' : 'TARGET MISSED'}.`
	);
	return median < SEARCH_TARGET_MS;
}

async function kitBench(session: Session, pool: pg.Pool, episodeId: string): Promise<boolean> {
	const first = await session.get(`/api/episodes/${episodeId}/publish-kit`);
	if (first.status !== 200)
		throw new Error(`publish kit answered ${first.status}: ${first.body.slice(0, 300)}`);
	const kit = JSON.parse(first.body) as {
		characters: number;
		blocks: { id: string; text: string }[];
	};
	for (let index = 0; index < 10; index++)
		await session.get(`/api/episodes/${episodeId}/publish-kit`);
	await pool.query('SELECT pg_stat_statements_reset()');
	const wall: number[] = [];
	const server: number[] = [];
	for (let index = 0; index < KIT_REQUESTS; index++) {
		const answer = await session.get(`/api/episodes/${episodeId}/publish-kit`);
		wall.push(answer.wallMilliseconds);
		server.push(serverTiming(answer.headers.get('server-timing')));
	}
	const statements = (
		await pool.query<{ query: string; calls: number }>(
			`SELECT query, calls::int AS calls FROM pg_stat_statements
			 WHERE dbid = (SELECT oid FROM pg_database WHERE datname = current_database()) AND query NOT ILIKE '%pg_stat_statements%'
			 ORDER BY calls DESC`
		)
	).rows;
	// The kit's own statements read its tables; the rest are the hooks' session and channel lookups.
	const kitTables = /\b(segment_note|segment_note_part|chapter|caution|tracked_link)\b/;
	const kitStatements = statements.filter((statement) => kitTables.test(statement.query));
	const perRequest =
		kitStatements.reduce((sum, statement) => sum + statement.calls, 0) / KIT_REQUESTS;
	// One line per part, each a list item (the title and the disclosure above them are not).
	const partLines = kit.blocks
		.find((block) => block.id === 'parts')!
		.text.split('\n')
		.filter((line) => line.startsWith('- ')).length;
	printTable(
		`Publish kit, ${KIT_NOTES} notes showing ${KIT_PARTS} parts, 12 chapters, 10 caution cards, ${KIT_REQUESTS} requests after 11 warm-up`,
		`${KIT_QUERY_TARGET} queries or fewer per kit`,
		[
			{
				'': 'publish kit (JSON)',
				'part lines': String(partLines),
				characters: kit.characters.toLocaleString('en'),
				'kit queries per request': perRequest.toFixed(2),
				'API median': ms(percentile(wall, 0.5)),
				'API p95': ms(percentile(wall, 0.95)),
				'handler median': ms(percentile(server, 0.5))
			}
		]
	);
	console.log(
		`\n• Counted with pg_stat_statements, reset before the ${KIT_REQUESTS} measured requests: statements naming segment_note, chapter, caution or tracked_link.`
	);
	for (const statement of kitStatements)
		console.log(
			`  ${(statement.calls / KIT_REQUESTS).toFixed(2)} × ${statement.query.replace(/\s+/g, ' ').slice(0, 110)}…`
		);
	const others = statements.filter((statement) => !kitStatements.includes(statement));
	console.log(
		`• Other statements per request (sign-in session and channel lookups in the hooks): ${others.map((statement) => `${(statement.calls / KIT_REQUESTS).toFixed(2)} × ${statement.query.replace(/\s+/g, ' ').slice(0, 60)}…`).join('; ') || 'none'}.`
	);
	const ok = perRequest <= KIT_QUERY_TARGET && partLines === KIT_PARTS;
	console.log(
		`• ${perRequest.toFixed(2)} kit queries per request: ${ok ? 'target met' : 'TARGET MISSED'}.`
	);

	// No target: for the record, the featured parts list, whose script check reads the whole catalogue.
	const featured: number[] = [];
	let warnings = 0;
	for (let index = 0; index < 30; index++) {
		const answer = await session.get(`/api/episodes/${episodeId}/featured-parts`);
		if (answer.status !== 200) throw new Error(`featured parts answered ${answer.status}`);
		warnings = JSON.parse(answer.body).warnings.length;
		featured.push(answer.wallMilliseconds);
	}
	console.log(
		`• Featured parts list of the same episode (script of 10 segments checked against ${CATALOGUE_PARTS.toLocaleString('en')} parts, ${warnings} warnings): API median ${ms(percentile(featured.slice(5), 0.5))}, p95 ${ms(percentile(featured.slice(5), 0.95))} (no target).`
	);
	return ok;
}

async function main() {
	const world = await openBenchWorld('bench-parts');
	let ok: boolean;
	try {
		const pool = world.pool;
		const [{ id: channelId }] = (
			await pool.query(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`)
		).rows;
		const filled = performance.now();
		await addCatalogue(pool, channelId);
		const episodeId = await bigEpisode(pool, channelId);
		console.log(
			`Added ${CATALOGUE_PARTS.toLocaleString('en')} parts and the big episode in ${((performance.now() - filled) / 1000).toFixed(1)} s.`
		);

		const baseUrl = await world.startServer();
		console.log(
			`Wrenchroll parts bench on ${process.platform} ${process.arch}, Node ${process.version}, built server ${world.buildDir}`
		);
		const session = await signIn(baseUrl, 'priya@torquehaven.test');
		// A bench that throws is reported and counted as missed; the other still runs.
		const attempt = (name: string, run: () => Promise<boolean>) =>
			run().catch((failure) => {
				console.error(
					`\n${name}: FAILED TO RUN\n${failure instanceof Error ? failure.stack : failure}\n`
				);
				return false;
			});
		const searchOk = await attempt('catalogue search', () => searchBench(session));
		const kitOk = await attempt('publish kit', () => kitBench(session, pool, episodeId));
		ok = searchOk && kitOk;
		console.log(`\n${ok ? 'all targets met' : 'TARGET MISSED'}\n`);
	} finally {
		await world.close();
	}
	process.exit(ok ? 0 : 1);
}

await main();
