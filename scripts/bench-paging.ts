/**
 * Paging benchmarks (not tests): lists at a real channel's size. Prints a table per bench and
 * exits 1 when a target is missed.
 *
 *   npm run bench "episode list"   the episode list (API and page) at 10 and at 10,000 episodes,
 *                                  and how much the server's memory grows while serving it
 *   npm run bench "parts search"   catalogue search at 20,000 and at 200,000 parts, and featured
 *                                  parts ("named in the script") at 200,000
 *   npm run bench "chapter export at scale"   every export format at 1,000 and 10,000 chapters
 *   npm run bench "footage and notes"   an episode's footage and notes at 10,000 rows each: a
 *                                  deep page (the 150th of 50) against the first
 *
 * Each bench starts its own throwaway PostgreSQL (scripts/lib/bench-world.ts), runs the real
 * migrate and seed scripts, adds its data in channels of its own (scripts/lib/bench-paging-seed.ts)
 * and starts the built server. Times are medians of the whole request over loopback (sign-in
 * hooks included) unless a row says "server": then the route's Server-Timing `total`. Where a
 * bench compares two sizes (or two pages), it measures them in interleaved rounds and prints
 * min / median / max of the rounds' medians and the ratio of their medians.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { openBenchWorld, signedInSession, type BenchSession } from './lib/bench-world.ts';
import {
	addChapteredEpisode,
	addEpisodes,
	addLoggedEpisode,
	addParts,
	addScriptedEpisode,
	benchChannel
} from './lib/bench-paging-seed.ts';

const WARM_UP = 20;
const MEASURED = 100;
/** Interleaved rounds of baseline and subject in the benches that compare two sizes. */
const ROUNDS = 3;
const GROWTH_LIMIT = 2;
const MEMORY_LIMIT_MB = 50;
const PARTS_MEDIAN_TARGET_MS = 10;
const FEATURED_TARGET_MS = 20;
const CHAPTER_TARGETS_MS: Record<number, number> = { 1000: 5, 10000: 40 };

interface Row {
	label: string;
	cells: string[];
	ok: boolean;
}

function median(samples: number[]): number {
	const sorted = [...samples].sort((a, b) => a - b);
	return sorted[Math.floor((sorted.length - 1) / 2)];
}
const ms = (value: number) => `${value.toFixed(2)} ms`;

function serverTotal(headers: Headers): number {
	const match = /(?:^|,)\s*total;dur=([0-9.]+)/.exec(headers.get('server-timing') ?? '');
	if (!match) throw new Error('no Server-Timing total');
	return Number(match[1]);
}

/**
 * Median wall time (or Server-Timing total) of `paths` asked round-robin after a warm-up. With
 * `memory`, each measured request's growth of the server's memory goes into it (see requestGrowth).
 */
async function measure(
	session: BenchSession,
	paths: string[],
	{
		server = false,
		measured = MEASURED,
		memory
	}: { server?: boolean; measured?: number; memory?: MemoryWatch } = {}
): Promise<number> {
	for (let index = 0; index < WARM_UP; index++) await session.get(paths[index % paths.length]);
	const samples: number[] = [];
	for (let index = 0; index < measured; index++) {
		const path = paths[index % paths.length];
		const answer = memory ? await memory.around(() => session.get(path)) : await session.get(path);
		if (answer.status !== 200) throw new Error(`${path} answered ${answer.status}`);
		samples.push(server ? serverTotal(answer.headers) : answer.wallMilliseconds);
	}
	return median(samples);
}

/** Resident and peak resident memory of a process, in MB (Linux /proc). */
function memoryOf(pid: number): { rss: number; peak: number } {
	const status = readFileSync(`/proc/${pid}/status`, 'utf8');
	const read = (key: string) => Number(new RegExp(`${key}:\\s+(\\d+) kB`).exec(status)?.[1] ?? 0);
	return { rss: read('VmRSS') / 1024, peak: read('VmHWM') / 1024 };
}

/** How much one request at a time grew a process's resident memory; the largest growth seen. */
interface MemoryWatch {
	around<T>(request: () => Promise<T>): Promise<T>;
	/** The largest growth of one request, MB. */
	largest: number;
	/** The highest peak resident size seen during any watched request, MB. */
	highest: number;
}

/**
 * Watches the server's memory request by request: before each request the process's peak
 * resident size (VmHWM) is reset to its current size (writing 5 to /proc/<pid>/clear_refs, Linux
 * 4.0 and later; proc(5)), and after it the new peak less the size before is that request's growth.
 */
function requestGrowth(pid: number): MemoryWatch {
	const watch: MemoryWatch = {
		largest: 0,
		highest: 0,
		async around(request) {
			writeFileSync(`/proc/${pid}/clear_refs`, '5');
			const before = memoryOf(pid).rss;
			const answer = await request();
			const { peak } = memoryOf(pid);
			watch.largest = Math.max(watch.largest, peak - before);
			watch.highest = Math.max(watch.highest, peak);
			return answer;
		}
	};
	return watch;
}

/** min / median / max of the rounds' medians, in ms. */
const spread = (values: number[]) =>
	`${[Math.min(...values), median(values), Math.max(...values)].map((value) => value.toFixed(2)).join(' / ')} ms`;

/**
 * A baseline and a subject measured in `ROUNDS` interleaved rounds (the baseline first in odd
 * rounds, second in even ones, so a machine getting busier or quieter weighs on both alike): each
 * round's median of each, then the ratio of the medians of those round medians.
 */
async function interleaved(
	baseline: () => Promise<number>,
	subject: () => Promise<number>
): Promise<{ baseline: number[]; subject: number[]; ratio: number }> {
	const times = { baseline: [] as number[], subject: [] as number[] };
	for (let round = 0; round < ROUNDS; round++) {
		if (round % 2 === 0) {
			times.baseline.push(await baseline());
			times.subject.push(await subject());
		} else {
			times.subject.push(await subject());
			times.baseline.push(await baseline());
		}
	}
	return { ...times, ratio: median(times.subject) / median(times.baseline) };
}

function print(title: string, target: string, columns: string[], rows: Row[], notes: string[]) {
	const table = [
		columns,
		...rows.map((row) => [row.label, ...row.cells, row.ok ? 'met' : 'MISSED'])
	];
	const widths = table[0].map((_, index) => Math.max(...table.map((line) => line[index].length)));
	const line = (cells: string[]) =>
		cells
			.map((cell, i) => (i === 0 ? cell.padEnd(widths[i]) : cell.padStart(widths[i])))
			.join('  ');
	console.log(`\n${title}\ntarget: ${target}\n`);
	console.log(line(table[0]));
	console.log(widths.map((width) => '─'.repeat(width)).join('  '));
	for (const cells of table.slice(1)) console.log(line(cells));
	for (const note of notes) console.log(`• ${note}`);
	const ok = rows.every((row) => row.ok);
	console.log(`\n${ok ? 'all targets met' : 'TARGET MISSED'}\n`);
	return ok;
}

async function episodeListBench(): Promise<boolean> {
	const world = await openBenchWorld('paging-episodes');
	try {
		const small = await benchChannel(world.pool, 'Bench small bay', 'small@bench.test');
		const big = await benchChannel(world.pool, 'Bench big bay', 'big@bench.test');
		await addEpisodes(world.pool, small.channelId, small.personId, 10);
		await addEpisodes(world.pool, big.channelId, big.personId, 10_000);
		const baseUrl = await world.startServer();
		const sessions = {
			10: await signedInSession(baseUrl, 'small@bench.test'),
			10_000: await signedInSession(baseUrl, 'big@bench.test')
		};
		const kinds = [
			{ label: 'API, default order', paths: ['/api/episodes'] },
			{
				label: 'API, every sort',
				paths: ['publish', 'title', 'stage', 'created'].flatMap((sort) =>
					['asc', 'desc'].map((direction) => `/api/episodes?sort=${sort}&direction=${direction}`)
				)
			},
			{ label: 'page /episodes', paths: ['/episodes', '/episodes?sort=title'] }
		];
		const rows: Row[] = [];
		const pid = world.serverPid()!;
		const memory = { 10: requestGrowth(pid), 10_000: requestGrowth(pid) };
		// A deep page: the 150th page of 50 (rows 7,451–7,500), reached by following `next`.
		let next: string | null = null;
		for (let page = 1; page < 150; page++) {
			const answer = await sessions[10_000].get(
				`/api/episodes${next ? `?after=${encodeURIComponent(next)}` : ''}`
			);
			next = (JSON.parse(answer.body) as { next: string | null }).next;
		}
		const warm = memoryOf(pid).rss;
		for (const kind of kinds) {
			const times = await interleaved(
				() => measure(sessions[10], kind.paths, { memory: memory[10] }),
				() => measure(sessions[10_000], kind.paths, { memory: memory[10_000] })
			);
			rows.push({
				label: kind.label,
				cells: [spread(times.baseline), spread(times.subject), `${times.ratio.toFixed(2)}×`],
				ok: times.ratio <= GROWTH_LIMIT
			});
		}
		const deep = await interleaved(
			() => measure(sessions[10_000], ['/api/episodes'], { memory: memory[10_000] }),
			() =>
				measure(sessions[10_000], [`/api/episodes?after=${encodeURIComponent(next!)}`], {
					memory: memory[10_000]
				})
		);
		rows.push({
			label: 'API, page 150 vs page 1 (10,000)',
			cells: [spread(deep.baseline), spread(deep.subject), `${deep.ratio.toFixed(2)}×`],
			ok: deep.ratio <= GROWTH_LIMIT
		});
		rows.push({
			label: 'server memory, most one request added',
			cells: [
				`+${memory[10].largest.toFixed(1)} MB`,
				`+${memory[10_000].largest.toFixed(1)} MB`,
				''
			],
			ok: Math.max(memory[10].largest, memory[10_000].largest) <= MEMORY_LIMIT_MB
		});
		const highest = Math.max(memory[10].highest, memory[10_000].highest);
		return print(
			`Episode list, one page of 50, at 10 and 10,000 episodes (${ROUNDS} interleaved rounds of ${MEASURED} requests each after ${WARM_UP} warm-up)`,
			`at 10,000 at most ${GROWTH_LIMIT}× the time at 10; no request grows the server's memory by more than ${MEMORY_LIMIT_MB} MB`,
			['', '10 episodes', '10,000 episodes', 'ratio', ''],
			rows,
			[
				'Times are whole requests over loopback (sign-in hooks included): min / median / max of the rounds’ medians; the ratio is of the medians.',
				'Memory: before each measured request the server’s peak resident size (VmHWM) is reset to its current size (/proc/<pid>/clear_refs); the row shows the largest peak less the size before, over every request at each size.',
				`The process as a whole: ${warm.toFixed(0)} MB resident before the first round (after sign-in and the walk to page 150), at most ${highest.toFixed(0)} MB during the rounds (+${(highest - warm).toFixed(0)} MB: V8 lets its old generation grow between full collections while pages are rendered; shown, not judged: the target is per request).`
			]
		);
	} finally {
		await world.close();
	}
}

/** Searches of every kind the catalogue page makes; cursors are followed for deep pages. */
const SEARCHES = [
	'/api/parts',
	'/api/parts?sort=name&dir=desc',
	'/api/parts?sort=price',
	'/api/parts?q=coil',
	'/api/parts?q=spacer%20pair',
	'/api/parts?q=forged%203%20in',
	'/api/parts?q=kestrelmark',
	'/api/parts?q=BN-LB',
	'/api/parts?q=BN-SHK-0019',
	'/api/parts?q=coil&status=active&sort=price&dir=desc',
	'/api/parts?category=Steering&sort=name',
	'/api/parts?q=nothing-like-this'
];

async function partsSearchBench(): Promise<boolean> {
	const world = await openBenchWorld('paging-parts');
	try {
		const small = await benchChannel(world.pool, 'Bench small catalogue', 'small@bench.test');
		const big = await benchChannel(world.pool, 'Bench big catalogue', 'big@bench.test');
		await addParts(world.pool, small.channelId, 20_000);
		await addParts(world.pool, big.channelId, 200_000);
		const scripted = await addScriptedEpisode(world.pool, big.channelId);
		const baseUrl = await world.startServer();
		const sessions = {
			20_000: await signedInSession(baseUrl, 'small@bench.test'),
			200_000: await signedInSession(baseUrl, 'big@bench.test')
		};
		// Deep pages of a category filter: the 40th page of 25, reached through the cursors.
		const deepPaths: Record<number, string> = {};
		for (const size of [20_000, 200_000] as const) {
			let next: string | null = null;
			for (let page = 1; page < 40; page++) {
				const answer = await sessions[size].get(
					`/api/parts?category=Steering&sort=name${next ? `&after=${encodeURIComponent(next)}` : ''}`
				);
				next = (JSON.parse(answer.body) as { next: string | null }).next;
			}
			deepPaths[size] = `/api/parts?category=Steering&sort=name&after=${encodeURIComponent(next!)}`;
		}
		const rows: Row[] = [];
		const searches = (size: 20_000 | 200_000) => [...SEARCHES, deepPaths[size]];
		const wall = await interleaved(
			() => measure(sessions[20_000], searches(20_000)),
			() => measure(sessions[200_000], searches(200_000))
		);
		for (const [size, rounds] of [
			[20_000, wall.baseline],
			[200_000, wall.subject]
		] as const) {
			const server = await measure(sessions[size], searches(size), { server: true });
			rows.push({
				label: `${size.toLocaleString('en')} parts`,
				cells: [spread(rounds), ms(server)],
				ok: size === 20_000 || median(rounds) <= PARTS_MEDIAN_TARGET_MS
			});
		}
		rows.push({
			label: 'growth 20k → 200k',
			cells: [`${wall.ratio.toFixed(2)}×`, ''],
			ok: wall.ratio <= GROWTH_LIMIT
		});
		const featured = await measure(sessions[200_000], [`/api/episodes/${scripted}/featured-parts`]);
		rows.push({
			label: 'featured parts at 200,000',
			cells: [ms(featured), ''],
			ok: featured <= FEATURED_TARGET_MS
		});
		return print(
			`Catalogue search at 20,000 and 200,000 parts (${ROUNDS} interleaved rounds of ${MEASURED} searches of ${SEARCHES.length + 1} kinds each, after ${WARM_UP} warm-up)`,
			`median under ${PARTS_MEDIAN_TARGET_MS} ms at 200,000 and at most ${GROWTH_LIMIT}× the 20,000 median; featured parts under ${FEATURED_TARGET_MS} ms`,
			['', 'request: min / median / max of rounds', 'median (server)', ''],
			rows,
			[
				'Request times: each round’s median, min / median / max over the rounds; growth is the ratio of their medians. Server: one further run of each size.',
				'Counts stop at 250 ("250+"; a first page with no page after it is its own count); deep pages follow the cursor instead of skipping rows.',
				'Featured parts asks which script words begin a SKU or name, then looks up only the phrases starting with one (byte-ordered lower(sku) and lower(name) indexes).'
			]
		);
	} finally {
		await world.close();
	}
}

async function chapterExportBench(): Promise<boolean> {
	const world = await openBenchWorld('paging-chapters');
	try {
		const bay = await benchChannel(world.pool, 'Bench chapter bay', 'chapters@bench.test');
		const episodes = {
			1000: await addChapteredEpisode(world.pool, bay.channelId, 1000),
			10000: await addChapteredEpisode(world.pool, bay.channelId, 10_000)
		};
		const baseUrl = await world.startServer();
		const session = await signedInSession(baseUrl, 'chapters@bench.test');
		const rows: Row[] = [];
		for (const count of [1000, 10000] as const) {
			const paths = ['txt', 'vtt', 'ffmetadata', 'json', 'csv'].map(
				(format) => `/api/episodes/${episodes[count]}/chapters?format=${format}`
			);
			const first = await session.get(paths[0]);
			if (first.status !== 200) throw new Error(`export answered ${first.status}: ${first.body}`);
			const server = await measure(session, paths, { server: true });
			const wall = await measure(session, paths);
			rows.push({
				label: `${count.toLocaleString('en')} chapters`,
				cells: [ms(server), ms(wall)],
				ok: server <= CHAPTER_TARGETS_MS[count]
			});
		}
		return print(
			'Chapter export at 1,000 and 10,000 chapters, every format round-robin',
			'server median at most 5 ms at 1,000 and 40 ms at 10,000',
			['', 'median (server)', 'median (request)', ''],
			rows,
			['"server" is the route’s Server-Timing total: the one query and writing the file.']
		);
	} finally {
		await world.close();
	}
}

/** Follows `next` from `path` until the page before `page`; answers the `page`th page's path. */
async function pathOfPage(session: BenchSession, path: string, page: number): Promise<string> {
	const separator = path.includes('?') ? '&' : '?';
	let next: string | null = null;
	for (let index = 1; index < page; index++) {
		const answer = await session.get(
			next ? `${path}${separator}after=${encodeURIComponent(next)}` : path
		);
		if (answer.status !== 200) throw new Error(`${path} answered ${answer.status}`);
		next = (JSON.parse(answer.body) as { next: string | null }).next;
		if (!next) throw new Error(`${path} has fewer than ${page} pages`);
	}
	return `${path}${separator}after=${encodeURIComponent(next!)}`;
}

const LOGGED_ROWS = 10_000;
const DEEP_PAGE = 150;

async function footageAndNotesBench(): Promise<boolean> {
	const world = await openBenchWorld('paging-footage-notes');
	try {
		const bay = await benchChannel(world.pool, 'Bench logging bay', 'logged@bench.test');
		const episode = await addLoggedEpisode(world.pool, bay.channelId, bay.personId, LOGGED_ROWS);
		const baseUrl = await world.startServer();
		const session = await signedInSession(baseUrl, 'logged@bench.test');
		const lists = [
			{ label: 'footage API, newest first', path: `/api/episodes/${episode}/footage` },
			{ label: 'footage API, by clip', path: `/api/episodes/${episode}/footage?sort=clip` },
			{
				label: 'footage API, by length',
				path: `/api/episodes/${episode}/footage?sort=duration&direction=desc`
			},
			{ label: 'notes API', path: `/api/episodes/${episode}/notes` },
			{ label: 'footage page', path: `/episodes/${episode}/footage` },
			{ label: 'notes page', path: `/episodes/${episode}/notes` }
		];
		const rows: Row[] = [];
		for (const list of lists) {
			const deepPath = list.path.startsWith('/api/')
				? await pathOfPage(session, list.path, DEEP_PAGE)
				: // A page's "More" link carries the same cursor as its API's `next`.
					(await pathOfPage(session, `/api${list.path}`, DEEP_PAGE)).replace(/^\/api/, '');
			const times = await interleaved(
				() => measure(session, [list.path], { measured: 50 }),
				() => measure(session, [deepPath], { measured: 50 })
			);
			rows.push({
				label: list.label,
				cells: [spread(times.baseline), spread(times.subject), `${times.ratio.toFixed(2)}×`],
				ok: times.ratio <= GROWTH_LIMIT
			});
		}
		return print(
			`An episode's footage and notes at ${LOGGED_ROWS.toLocaleString('en')} rows each, page ${DEEP_PAGE} of 50 against page 1 (${ROUNDS} interleaved rounds of 50 requests each after ${WARM_UP} warm-up)`,
			`a deep page at most ${GROWTH_LIMIT}× the first`,
			['', 'page 1', `page ${DEEP_PAGE}`, 'ratio', ''],
			rows,
			[
				'Times are whole requests over loopback (sign-in hooks included): min / median / max of the rounds’ medians; the ratio is of the medians.',
				'Notes tie on program time in runs of 20 and every tenth is unplaced; within a tie they sort by segment position.'
			]
		);
	} finally {
		await world.close();
	}
}

const BENCHES: Record<string, () => Promise<boolean>> = {
	'episode list': episodeListBench,
	'parts search': partsSearchBench,
	'chapter export at scale': chapterExportBench,
	'footage and notes': footageAndNotesBench
};

async function main() {
	const named = process.argv.slice(2);
	const unknown = named.filter((name) => !(name in BENCHES));
	if (unknown.length) throw new Error(`no paging bench named ${unknown.join(', ')}`);
	let ok = true;
	for (const [name, bench] of Object.entries(BENCHES)) {
		if (named.length && !named.includes(name)) continue;
		try {
			ok = (await bench()) && ok;
		} catch (failure) {
			console.error(
				`\n${name}: FAILED TO RUN\n${failure instanceof Error ? failure.stack : failure}\n`
			);
			ok = false;
		}
	}
	process.exit(ok ? 0 : 1);
}

await main();
