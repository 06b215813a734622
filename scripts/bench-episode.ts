/**
 * Episode page and episode API benchmark (not a test): at a real channel's size (npm run
 * bench:seed's data: 10,000 episodes, 200,000 parts, an episode of 10,000 chapters), 50
 * connections ask for one episode's page and its API for a while, and the same number ask a bare
 * node:http + pg server (scripts/lib/bare-episode-server.ts) that sends PostgreSQL the very
 * statements the app sent for one such request (recorded from the app first, recordStatements)
 * and answers their rows as JSON, in ROUNDS rounds with the app and the bare server taking turns.
 * Prints each side's throughput and p99 (min, median, max over the rounds), the ratios of the
 * medians and each round's throughput ratio, and exits 1 when a target is missed.
 *
 * Targets: throughput at least 0.6 of the bare server's, p99 at most 2× the bare p99.
 *
 * The app sends the reads it compiles once as named prepared statements (parsed and planned once
 * per connection), so the bare server judged against sends those named too: the same statements
 * sent the same way, so the ratio is what the app's own layers cost. For reference (no target), a
 * second bare server sends them all unnamed, as node-postgres does by default; it takes its turn
 * in every round too.
 *
 *   npm run bench episode        (npm run bench builds first when the build is stale)
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { Agent, request } from 'node:http';
import path from 'node:path';
import {
	openBenchWorld,
	processTreeCpuMs,
	signInCookie,
	startBareServer,
	waitForHttp,
	type BareServer,
	type BenchWorld
} from './lib/bench-world.ts';
import { fillBenchChannel } from './lib/scale-data.ts';
import { percentile } from './lib/percentile.ts';

const CONNECTIONS = 50;
const WARM_UP_MS = 3_000;
const MEASURE_MS = 6_000;
const ROUNDS = 3;
const THROUGHPUT_TARGET = 0.6;
const P99_TARGET = 2;

interface Load {
	requests: number;
	perSecond: number;
	p50: number;
	p99: number;
	failures: number;
	/** The server's CPU (user + system, its whole process tree) per measured request; null without /proc. */
	cpuPerRequest: number | null;
}

/** CONNECTIONS loops on kept-alive connections, each asking again as soon as an answer is read. */
async function load(
	url: string,
	headers: Record<string, string>,
	serverPid: number
): Promise<Load> {
	const agent = new Agent({ keepAlive: true, maxSockets: CONNECTIONS });
	const once = () =>
		new Promise<number>((resolve, reject) => {
			const started = performance.now();
			const outgoing = request(url, { agent, headers }, (incoming) => {
				incoming.resume();
				incoming.on('end', () =>
					incoming.statusCode === 200
						? resolve(performance.now() - started)
						: reject(incoming.statusCode)
				);
			});
			outgoing.on('error', reject);
			outgoing.end();
		});
	const run = async (milliseconds: number) => {
		const latencies: number[] = [];
		let failures = 0;
		const until = performance.now() + milliseconds;
		await Promise.all(
			Array.from({ length: CONNECTIONS }, async () => {
				while (performance.now() < until)
					await once().then(
						(latency) => latencies.push(latency),
						() => failures++
					);
			})
		);
		return { latencies, failures };
	};
	await run(WARM_UP_MS);
	const cpuBefore = processTreeCpuMs(serverPid);
	const started = performance.now();
	const { latencies, failures } = await run(MEASURE_MS);
	const seconds = (performance.now() - started) / 1000;
	const cpuAfter = processTreeCpuMs(serverPid);
	agent.destroy();
	return {
		requests: latencies.length,
		perSecond: latencies.length / seconds,
		p50: percentile(latencies, 0.5),
		p99: percentile(latencies, 0.99),
		failures,
		cpuPerRequest:
			cpuBefore === null || cpuAfter === null ? null : (cpuAfter - cpuBefore) / latencies.length
	};
}

interface RecordedRequest {
	method: string;
	path: string;
	statements: { sql: string; parameters: unknown[]; named: boolean }[];
}

/**
 * What the app sends PostgreSQL for one episode API request and one episode page request, as the
 * producer: a server of its own records them (WRENCHROLL_RECORD_QUERIES, query-count.ts), each
 * request asked twice so the second finds everything warm. Written to a file for the bare servers.
 */
async function recordStatements(world: BenchWorld, episodeId: string) {
	const recording = path.join(world.work, 'recorded-statements.jsonl');
	const base = await world.startServer({
		WRENCHROLL_COUNT_QUERIES: '1',
		WRENCHROLL_RECORD_QUERIES: recording
	});
	const cookie = await signInCookie(base, 'dana@torquehaven.test');
	const paths = { api: `/api/episodes/${episodeId}`, page: `/episodes/${episodeId}` };
	for (const pathname of [paths.api, paths.api, paths.page, paths.page]) {
		const answer = await fetch(base + pathname, { headers: { cookie, accept: 'text/html' } });
		await answer.text();
		if (answer.status !== 200) throw new Error(`recording: ${pathname} answered ${answer.status}`);
	}
	await world.stopServer();
	const requests = readFileSync(recording, 'utf8')
		.trim()
		.split('\n')
		.map((line) => JSON.parse(line) as RecordedRequest);
	const last = (pathname: string) => {
		const found = requests.findLast(
			(request) => request.method === 'GET' && request.path === pathname
		);
		if (!found || found.statements.length === 0)
			throw new Error(`recording: no statements for GET ${pathname}`);
		return found.statements;
	};
	const recorded = { api: last(paths.api), page: last(paths.page) };
	const file = path.join(world.work, 'bare-statements.json');
	writeFileSync(file, JSON.stringify(recorded));
	const told = (statements: RecordedRequest['statements']) =>
		`${statements.length} statements, ${statements.filter((statement) => statement.named).length} named`;
	return { file, api: told(recorded.api), page: told(recorded.page) };
}

async function main() {
	const world = await openBenchWorld('bench-episode');
	let bare: BareServer | null = null;
	let bareNamed: BareServer | null = null;
	let ok: boolean;
	try {
		const filling = performance.now();
		await fillBenchChannel(world.pool, 'Torquehaven Garage');
		console.log(
			`bench:seed data written in ${((performance.now() - filling) / 1000).toFixed(0)} s.`
		);
		// The demo's episode with the most work on it (segments and notes), as the crew would open it.
		const [episode] = (
			await world.pool.query<{ id: string; title: string }>(
				`SELECT e.id, e.title FROM episode e JOIN channel c ON c.id = e.channel_id
				 WHERE c.name = 'Torquehaven Garage' AND e.title NOT LIKE '% · %' AND e.slug <> 'bench-ten-thousand-chapters'
				 ORDER BY (SELECT count(*) FROM segment s WHERE s.episode_id = e.id)
				        + (SELECT count(*) FROM segment_note n WHERE n.episode_id = e.id) DESC
				 LIMIT 1`
			)
		).rows;
		const statements = await recordStatements(world, episode.id);
		const baseUrl = await world.startServer();
		const appPid = world.serverPid()!;
		const cookie = await signInCookie(baseUrl, 'dana@torquehaven.test');
		const bareEnv = { BARE_STATEMENTS: statements.file };
		bare = await startBareServer('bare-episode-server.ts', world.cluster.url, bareEnv);
		bareNamed = await startBareServer('bare-episode-server.ts', world.cluster.url, {
			...bareEnv,
			BARE_NAMED: '1'
		});
		const bareBase = bare.base;
		const namedBase = bareNamed.base;
		await waitForHttp(`${bareBase}/api`, 30_000);
		await waitForHttp(`${namedBase}/api`, 30_000);
		console.log(
			`The bare servers send the statements the app sent for one API request (${statements.api}) and one page request (${statements.page}), recorded from the app.`
		);
		console.log(
			`Wrenchroll episode bench on ${process.platform} ${process.arch}, Node ${process.version}: “${episode.title}” as the producer, ${CONNECTIONS} connections, ${WARM_UP_MS / 1000} s warm-up then ${MEASURE_MS / 1000} s measured each, ${ROUNDS} rounds taking turns with the bare server`
		);
		const targets = [
			{
				label: 'episode API (GET /api/episodes/[id])',
				app: () => load(`${baseUrl}/api/episodes/${episode.id}`, { cookie }, appPid),
				bare: () => load(`${bareBase}/api`, {}, bare!.pid),
				named: () => load(`${namedBase}/api`, {}, bareNamed!.pid)
			},
			{
				label: 'episode page (GET /episodes/[id], HTML)',
				app: () =>
					load(`${baseUrl}/episodes/${episode.id}`, { cookie, accept: 'text/html' }, appPid),
				bare: () => load(`${bareBase}/page`, {}, bare!.pid),
				named: () => load(`${namedBase}/page`, {}, bareNamed!.pid)
			}
		];
		// Rounds interleave app and bare so a change in the machine's load falls on both alike.
		const measured = targets.map(() => ({
			app: [] as Load[],
			bare: [] as Load[],
			named: [] as Load[]
		}));
		for (let round = 0; round < ROUNDS; round++)
			for (const [index, target] of targets.entries()) {
				measured[index].app.push(await target.app());
				measured[index].bare.push(await target.bare());
				measured[index].named.push(await target.named());
			}
		const ms = (value: number) => `${value.toFixed(1)} ms`;
		const spread = (values: number[], format: (value: number) => string) => {
			const sorted = [...values].sort((a, b) => a - b);
			return `min ${format(sorted[0])}  median ${format(percentile(sorted, 0.5))}  max ${format(sorted.at(-1)!)}`;
		};
		const perSecond = (value: number) => `${value.toFixed(0)}/s`;
		console.log('');
		const rows = targets.map(({ label }, index) => {
			const { app, bare: baseline, named } = measured[index];
			const median = (loads: Load[], pick: (load: Load) => number) =>
				percentile(loads.map(pick), 0.5);
			const throughput =
				median(app, (load) => load.perSecond) / median(named, (load) => load.perSecond);
			const p99 = median(app, (load) => load.p99) / median(named, (load) => load.p99);
			const failures = app.reduce((sum, load) => sum + load.failures, 0);
			const met = throughput >= THROUGHPUT_TARGET && p99 <= P99_TARGET && failures === 0;
			const roundRatios = app.map((load, round) =>
				(load.perSecond / named[round].perSecond).toFixed(2)
			);
			console.log(label);
			for (const [name, loads] of [
				['app ', app],
				['bare', named],
				['bare, SQL unnamed', baseline]
			] as const) {
				const cpu = loads.map((load) => load.cpuPerRequest);
				const cpuShown = cpu.every((value) => value !== null)
					? `;  server CPU per request ${spread(cpu as number[], (value) => `${value.toFixed(2)} ms`)}`
					: '';
				console.log(
					`  ${name}  throughput ${spread(
						loads.map((load) => load.perSecond),
						perSecond
					)};  p99 ${spread(
						loads.map((load) => load.p99),
						ms
					)}  (${loads.reduce((sum, load) => sum + load.requests, 0)} requests, ${loads.reduce((sum, load) => sum + load.failures, 0)} failed)${cpuShown}`
				);
			}
			console.log(
				`  throughput ${throughput.toFixed(2)} of bare (rounds ${roundRatios.join(', ')}; target ≥ ${THROUGHPUT_TARGET}), p99 ${p99.toFixed(2)}× bare (target ≤ ${P99_TARGET}): ${met ? 'met' : 'MISSED'}`
			);
			const unnamedThroughput =
				median(app, (load) => load.perSecond) / median(baseline, (load) => load.perSecond);
			const unnamedP99 = median(app, (load) => load.p99) / median(baseline, (load) => load.p99);
			console.log(
				`  for reference, against the bare server sending its SQL unnamed: throughput ${unnamedThroughput.toFixed(2)}, p99 ${unnamedP99.toFixed(2)}× (no target)\n`
			);
			return met;
		});
		ok = rows.every(Boolean);
		console.log(ok ? 'all targets met' : 'TARGET MISSED');
	} finally {
		await bare?.stop();
		await bareNamed?.stop();
		await world.close();
	}
	process.exit(ok ? 0 : 1);
}

await main();
