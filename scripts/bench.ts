/**
 * npm run bench: Wrenchroll's speed targets, measured on this machine. Not a test: it prints a
 * table and exits 1 when a target is missed.
 *
 * It starts its own throwaway PostgreSQL (with pg_stat_statements, to count queries), runs the real
 * migrate and seed scripts, starts the built server (WRENCHROLL_BUILD_DIR or build/) on loopback,
 * signs in as the demo producer and runs every bench in BENCHES (or only those named on the command
 * line: `tsx scripts/bench.ts "script reading"`). Add a bench by writing a function that takes the
 * BenchContext and returns BenchResult, and listing it in BENCHES.
 */
import path from 'node:path';
import { projectRoot } from './lib/config.ts';
import {
	openBenchWorld,
	signedInSession as signIn,
	type BenchSession as Session
} from './lib/bench-world.ts';
import { secondsToFrames } from '../src/lib/timecode.ts';
import { renderScriptMarkdown } from '../src/lib/server/episodes/markdown.ts';
import { countSpokenWords } from '../src/lib/script/timing.ts';
import { percentile } from './lib/percentile.ts';

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

// ---------------------------------------------------------------- script reading

const SCRIPT_READ_TARGET_MS = 200;
const HEALTH_TARGET_MS = 100;
const ORDINARY_PREVIEWS = 40;
const HOSTILE_PREVIEWS = 5;
const SETTLE_MS = 3_000;

/** Script Markdown of the kind the editor offers (headings, emphasis, links, lists, a table, a direction), cut to a length. */
function ordinaryScript(characters: number): string {
	const block = [
		'## Rear shocks',
		'',
		'**Loosen** the upper mount first, then the _lower_ bolt. Torque to 95 ft-lbs with the `WX-2210` socket and check [the kit](https://parts.example/kit "Lift kit"). [[B-roll: wrench close-up]]',
		'',
		'- chock the wheels',
		'- stands under the frame rails',
		'',
		'| Part | Torque |',
		'|:--|--:|',
		'| lug nut | 95 ft-lbs |',
		'',
		'> Say it slowly: never work under a vehicle held only by a jack.',
		'',
		''
	].join('\n');
	return block.repeat(Math.ceil(characters / block.length)).slice(0, characters);
}

/** The same text with its last characters replaced by a number, so the server cannot answer from memory. */
const variant = (markdown: string, index: number) =>
	markdown.slice(0, -8) + String(index).padStart(8, '0');

/** Keeps asking /healthz, one request after another, until `work` settles; each answer's time. */
async function healthWhile(baseUrl: string, work: Promise<unknown>): Promise<number[]> {
	let settled = false;
	const done = () => (settled = true);
	void work.then(done, done);
	const times: number[] = [];
	do {
		const started = performance.now();
		await (await fetch(`${baseUrl}/healthz`)).text();
		times.push(performance.now() - started);
	} while (!settled);
	return times;
}

/**
 * The live preview (POST /api/episodes/[id]/script-preview: HTML and word count, each read in a
 * script-reader worker with a time limit) for an ordinary 10-minute script, an ordinary script at
 * the 100,000-character limit, and 100,000 characters of `_a_a…` (on which marked is quadratic),
 * while /healthz is asked over and over. The bare baseline is the same render and count called
 * directly in this process, with no HTTP and no worker: what every preview cost the server's one
 * thread before.
 */
const scriptReadingBench: Bench = {
	name: 'script reading',
	async run(context) {
		const [episode] = await context.sql<{ id: string }>(
			`SELECT episode.id FROM episode JOIN channel ON channel.id = episode.channel_id
			 WHERE channel.name = 'Torquehaven Garage' ORDER BY episode.created_at LIMIT 1`
		);
		const session = await context.signIn('dana@torquehaven.test');
		const previewPath = `/api/episodes/${episode.id}/script-preview`;
		const hostile = '_a'.repeat(50_000);
		// `apart`: each preview waits SETTLE_MS after the last, so readers replaced after an overrun
		// have started (one preview on a settled server); otherwise they follow back to back.
		const cases = [
			{
				label: 'ordinary, 9,000 characters',
				markdown: ordinaryScript(9_000),
				requests: ORDINARY_PREVIEWS,
				apart: false
			},
			{
				label: 'ordinary, 30,000 characters',
				markdown: ordinaryScript(30_000),
				requests: ORDINARY_PREVIEWS,
				apart: false
			},
			{
				label: 'ordinary, 100,000 characters, apart',
				markdown: ordinaryScript(100_000),
				requests: HOSTILE_PREVIEWS,
				apart: true
			},
			{
				label: 'hostile _a_a…, 100,000 characters, apart',
				markdown: hostile,
				requests: HOSTILE_PREVIEWS,
				apart: true
			},
			{
				label: 'hostile _a_a…, 100,000 characters, back to back',
				markdown: hostile,
				requests: HOSTILE_PREVIEWS,
				apart: false
			}
		];
		const measured: {
			label: string;
			markdown: string;
			preview: number[];
			health: number[];
			plain: number;
		}[] = [];
		let variantNumber = 0;
		for (const { label, markdown, requests, apart } of cases) {
			const row = { label, markdown, preview: [] as number[], health: [] as number[], plain: 0 };
			for (let index = 0; index < requests; index++) {
				if (apart) await new Promise((resolve) => setTimeout(resolve, SETTLE_MS));
				const answer = session.post(previewPath, { markdown: variant(markdown, variantNumber++) });
				row.health.push(...(await healthWhile(context.baseUrl, answer)));
				const { status, body, wallMilliseconds } = await answer;
				if (status !== 200)
					throw new Error(`the preview answered ${status}: ${body.slice(0, 300)}`);
				if (
					(JSON.parse(body) as { html: string }).html.startsWith('<p><strong>Shown as plain text.')
				)
					row.plain += 1;
				row.preview.push(wallMilliseconds);
			}
			measured.push(row);
		}
		// The bare baseline, in this process, after all requests (it blocks this process, a minute for
		// the hostile text): ten runs of each ordinary text, one of the hostile one.
		const bareTimes = new Map<string, number[]>();
		for (const { markdown } of cases) {
			if (bareTimes.has(markdown)) continue;
			const bare: number[] = [];
			for (let run = 0; run < (markdown === hostile ? 1 : 10); run++) {
				const started = performance.now();
				renderScriptMarkdown(variant(markdown, run));
				countSpokenWords(variant(markdown, run));
				bare.push(performance.now() - started);
			}
			bareTimes.set(markdown, bare);
		}
		const rows: BenchRow[] = measured.map(({ label, markdown, preview, health, plain }) => {
			const ok =
				percentile(preview, 0.95) < SCRIPT_READ_TARGET_MS && Math.max(...health) < HEALTH_TARGET_MS;
			return {
				label,
				ok,
				cells: {
					requests: String(preview.length),
					'preview median': ms(percentile(preview, 0.5)),
					'preview p95': ms(percentile(preview, 0.95)),
					'/healthz max': ms(Math.max(...health)),
					'bare median': ms(percentile(bareTimes.get(markdown)!, 0.5)),
					'shown as plain': `${plain} of ${preview.length}`,
					target: ok ? 'met' : 'MISSED'
				}
			};
		});
		return {
			title:
				'Script preview (HTML and word count) over loopback, every text different, /healthz asked throughout',
			target: `preview p95 under ${SCRIPT_READ_TARGET_MS} ms and every /healthz under ${HEALTH_TARGET_MS} ms`,
			rows,
			notes: [
				'"bare median" is renderScriptMarkdown + countSpokenWords called directly in this process (no HTTP, no worker): what each preview held the server\'s only thread for before the script readers.',
				'A read that runs over the readers\' time limit answers with the text as plain paragraphs and a rough count ("shown as plain"); its worker is replaced, which takes about 0.3 s (more on a busy machine). One started spare takes the next read meanwhile; back to back, hostile previews wait for those starts ("back to back" row).',
				`"apart" rows wait ${SETTLE_MS / 1000} s before each preview, so every preview meets started readers.`
			],
			ok: rows.every((row) => row.ok)
		};
	}
};

const BENCHES: Bench[] = [chapterExportBench, scriptReadingBench];

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
		const named = process.argv.slice(2);
		const unknown = named.filter((name) => !BENCHES.some((bench) => bench.name === name));
		if (unknown.length) throw new Error(`no bench named ${unknown.join(', ')}`);
		for (const bench of BENCHES.filter((bench) => !named.length || named.includes(bench.name))) {
			// A bench that throws is reported and counted as missed; the others still run.
			try {
				const result = await bench.run(context);
				printResult(result);
				ok &&= result.ok;
			} catch (failure) {
				console.error(
					`\n${bench.name}: FAILED TO RUN\n${failure instanceof Error ? failure.stack : failure}\n`
				);
				ok = false;
			}
		}
	} finally {
		await world.close();
	}
	process.exit(ok ? 0 : 1);
}

await main();
