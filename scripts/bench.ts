/**
 * npm run bench: Wrenchroll's speed targets, measured on this machine. Not a test: it prints a
 * table and exits 1 when a target is missed.
 *
 * It starts its own throwaway PostgreSQL (with pg_stat_statements, to count queries), runs the real
 * migrate and seed scripts, starts the built server (WRENCHROLL_BUILD_DIR or build/) on loopback,
 * signs in as the demo producer and runs every bench in BENCHES. Add a bench by writing a
 * function that takes the BenchContext and returns BenchResult, and listing it in BENCHES.
 */
import path from 'node:path';
import { projectRoot } from './lib/config.ts';
import {
	openBenchWorld,
	signedInSession as signIn,
	type BenchSession as Session
} from './lib/bench-world.ts';
import { secondsToFrames } from '../src/lib/timecode.ts';

// ---------------------------------------------------------------- the framework

interface BenchContext {
	baseUrl: string;
	/** Queries against the bench database (not through the app). */
	sql<T = Record<string, unknown>>(text: string, params?: unknown[]): Promise<T[]>;
	signIn(email: string): Promise<Session>;
}

interface BenchRow {
	label: string;
	/** Columns in display order. */
	cells: Record<string, string>;
	/** True when this row meets its target. */
	ok: boolean;
}

interface BenchResult {
	title: string;
	target: string;
	rows: BenchRow[];
	notes: string[];
	ok: boolean;
}

interface Bench {
	name: string;
	run(context: BenchContext): Promise<BenchResult>;
}

/** Nearest-rank percentile (the value at rank ⌈p·n⌉ of the sorted samples). */
function percentile(samples: number[], fraction: number): number {
	const sorted = [...samples].sort((a, b) => a - b);
	return sorted[Math.max(0, Math.ceil(fraction * sorted.length) - 1)];
}

const ms = (value: number) => `${value.toFixed(2)} ms`;

// ---------------------------------------------------------------- benches

const EXPORT_FORMATS = ['txt', 'vtt', 'ffmetadata', 'json', 'csv'] as const;
const EXPORT_CHAPTERS = 1000;
const EXPORT_TARGET_MS = 20;
const WARM_UP_REQUESTS = 30;
const MEASURED_REQUESTS = 200;

/** Reads `name;dur=1.23` from a Server-Timing header. */
function serverTiming(header: string | null, name: string): number {
	const match = new RegExp(`(?:^|,)\\s*${name};dur=([0-9.]+)`).exec(header ?? '');
	if (!match)
		throw new Error(`the response has no Server-Timing "${name}" entry (got: ${header ?? 'none'})`);
	return Number(match[1]);
}

/** Titles with the characters each format escapes, so the bench pays for the escaping too. */
const BENCH_TITLES = [
	'Loosen the U-bolts, then "crack" the nuts',
	'Torque = 95 ft·lbf; step #3 \\ both sides',
	'Bleed the brakes\nthen check the lines',
	'リフトアップ完了',
	'Подвеска: проверка',
	'<b>Shackle</b> flip & re-torque'
];

/**
 * Chapter export with 1,000 chapters, every format: server time per export from the route's
 * Server-Timing `total` (time inside the handler: the one query plus writing the file; the auth
 * hooks before the handler are not in it), and the loopback round trip for comparison. Queries are
 * counted with pg_stat_statements over the measured requests.
 */
const chapterExportBench: Bench = {
	name: 'chapter export',
	async run(context) {
		const [channel] = await context.sql<{ id: string }>(
			`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`
		);
		const rate = '29.97';
		// A chapter every 12 s (the rules ask for at least 10 s) and 15 s for the last one.
		const starts = Array.from({ length: EXPORT_CHAPTERS }, (_, index) =>
			secondsToFrames(index * 12, rate)
		);
		const cut = secondsToFrames(EXPORT_CHAPTERS * 12 + 3, rate);
		const [episode] = await context.sql<{ id: string }>(
			`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
			 VALUES ($1, 'Bench: a thousand chapters', 'bench-thousand-chapters', 12000, $2, 'edit', $3) RETURNING id`,
			[channel.id, rate, cut]
		);
		await context.sql(
			`INSERT INTO chapter (episode_id, start_frame, title) SELECT $1, unnest($2::int[]), unnest($3::text[])`,
			[
				episode.id,
				starts,
				starts.map((_, index) => `${index + 1}. ${BENCH_TITLES[index % BENCH_TITLES.length]}`)
			]
		);

		const session = await context.signIn('dana@torquehaven.test');
		const exportPath = (format: string) => `/api/episodes/${episode.id}/chapters?format=${format}`;
		for (const format of EXPORT_FORMATS) {
			const first = await session.get(exportPath(format));
			if (first.status !== 200)
				throw new Error(`export ${format} answered ${first.status}: ${first.body.slice(0, 300)}`);
			for (let index = 1; index < WARM_UP_REQUESTS; index++) await session.get(exportPath(format));
		}

		await context.sql(`SELECT pg_stat_statements_reset()`);
		const rows: BenchRow[] = [];
		for (const format of EXPORT_FORMATS) {
			const total: number[] = [];
			const database: number[] = [];
			const wall: number[] = [];
			let bytes = 0;
			for (let index = 0; index < MEASURED_REQUESTS; index++) {
				const response = await session.get(exportPath(format));
				if (response.status !== 200)
					throw new Error(`export ${format} answered ${response.status}`);
				total.push(serverTiming(response.headers.get('server-timing'), 'total'));
				database.push(serverTiming(response.headers.get('server-timing'), 'db'));
				wall.push(response.wallMilliseconds);
				bytes = Buffer.byteLength(response.body);
			}
			const median = percentile(total, 0.5);
			rows.push({
				label: format,
				ok: median < EXPORT_TARGET_MS,
				cells: {
					size: `${(bytes / 1024).toFixed(1)} KiB`,
					'server median': ms(median),
					'server p95': ms(percentile(total, 0.95)),
					'query median': ms(percentile(database, 0.5)),
					'loopback median': ms(percentile(wall, 0.5)),
					'loopback p95': ms(percentile(wall, 0.95)),
					target: median < EXPORT_TARGET_MS ? 'met' : 'MISSED'
				}
			});
		}

		const requests = EXPORT_FORMATS.length * MEASURED_REQUESTS;
		const statements = await context.sql<{ query: string; calls: number }>(
			`SELECT query, calls::int AS calls FROM pg_stat_statements
			 WHERE dbid = (SELECT oid FROM pg_database WHERE datname = current_database())
			   AND query NOT ILIKE '%pg_stat_statements%'
			 ORDER BY calls DESC`
		);
		const readsEdit = statements.filter((statement) =>
			/\b(chapter|episode)\b/i.test(statement.query)
		);
		const others = statements.filter((statement) => !readsEdit.includes(statement));
		const exportCalls = readsEdit.reduce((sum, statement) => sum + statement.calls, 0);
		const oneRoundTrip = readsEdit.length === 1 && exportCalls === requests;
		const notes = [
			`Round trips per export: ${(exportCalls / requests).toFixed(2)} (pg_stat_statements over ${requests} measured exports: ${readsEdit.length} statement${readsEdit.length === 1 ? '' : 's'} reading episode/chapter, ${exportCalls} calls). ${oneRoundTrip ? 'One round trip: met.' : 'NOT one round trip.'}`,
			`Statements outside the export, per request (sign-in session and channel lookups in the hooks): ${others.map((statement) => `${(statement.calls / requests).toFixed(2)} × ${statement.query.replace(/\s+/g, ' ').slice(0, 70)}…`).join('; ') || 'none'}.`,
			`Server time is the route's Server-Timing "total": from entering the handler to the response being built (query + writing the file); the loopback figure is the whole HTTP request from this script, auth hooks included.`
		];
		return {
			title: `Chapter export, ${EXPORT_CHAPTERS.toLocaleString('en')} chapters at 29.97 fps, ${MEASURED_REQUESTS} requests per format after ${WARM_UP_REQUESTS} warm-up`,
			target: `median server time under ${EXPORT_TARGET_MS} ms per export, one database round trip`,
			rows,
			notes,
			ok: rows.every((row) => row.ok) && oneRoundTrip
		};
	}
};

const BENCHES: Bench[] = [chapterExportBench];

// ---------------------------------------------------------------- printing

function printResult(result: BenchResult) {
	const columns = ['', ...Object.keys(result.rows[0]?.cells ?? {})];
	const table = [columns, ...result.rows.map((row) => [row.label, ...Object.values(row.cells)])];
	const widths = columns.map((_, index) => Math.max(...table.map((line) => line[index].length)));
	const line = (cells: string[]) =>
		cells
			.map((cell, index) =>
				index === 0 ? cell.padEnd(widths[index]) : cell.padStart(widths[index])
			)
			.join('  ');
	console.log(`\n${result.title}`);
	console.log(`target: ${result.target}\n`);
	console.log(line(table[0]));
	console.log(widths.map((width) => '─'.repeat(width)).join('  '));
	for (const cells of table.slice(1)) console.log(line(cells));
	console.log('');
	for (const note of result.notes) console.log(`• ${note}`);
	console.log(`\n${result.ok ? 'all targets met' : 'TARGET MISSED'}\n`);
}

// ---------------------------------------------------------------- the world the benches run in

async function main() {
	const world = await openBenchWorld('bench');
	let ok = true;
	try {
		const baseUrl = await world.startServer();
		const context: BenchContext = {
			baseUrl,
			sql: async (text, params = []) => (await world.pool.query(text, params)).rows,
			signIn: (email) => signIn(baseUrl, email)
		};
		const buildDir = world.buildDir;
		console.log(
			`Wrenchroll benches on ${process.platform} ${process.arch}, Node ${process.version}, built server ${path.relative(projectRoot, buildDir).startsWith('..') ? buildDir : path.relative(projectRoot, buildDir)}`
		);
		for (const bench of BENCHES) {
			const result = await bench.run(context);
			printResult(result);
			ok &&= result.ok;
		}
	} finally {
		await world.close();
	}
	process.exit(ok ? 0 : 1);
}

await main();
