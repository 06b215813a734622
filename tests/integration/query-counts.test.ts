/**
 * Query budgets: how many database queries one request makes must not grow with the size of the
 * channel. The built server runs against a database of this file's own, seeded with the demo and
 * then scaled ×50 (every episode copied with all its work, and one episode's segments, scripts,
 * shots, takes, cautions, notes, chapters and history ×50 inside itself; scripts/lib/scale-data.ts),
 * with WRENCHROLL_COUNT_QUERIES=1, so every answer says in X-Query-Count how many queries it made
 * (src/lib/server/db/query-count.ts; never set in production).
 *
 * The budgets are ours, not from an outside source: the episode page and its API at most 6 queries
 * (one to know who is calling, one for the episode, one for everything its gate checks read, the
 * history, the producer's form choices, and one spare for the channel-link check of a person on
 * two channels); each tab page the number in TAB_BUDGETS; the home page the same number at ×1 and
 * ×50, for every role. A list that grows (N+1 queries, one per episode or per segment) breaks them.
 */
import type { ChildProcess } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { startServer, stopServer } from '../helpers/global-setup';
import { freePort, waitForHttp } from '../helpers/net';
import { demo } from '../helpers/http';
import { dropScratchDatabase, scratchDatabase } from '../helpers/scratch-database';
import { signInCookie } from '../../scripts/lib/bench-world';
import { scaleDemo } from '../../scripts/lib/scale-data';

const DATABASE = 'wrenchroll_query_counts';
const FACTOR = 50;
const EPISODE_BUDGET = 6;
/**
 * The tab pages under /episodes/<id>/ and their budgets: the counts measured at ×50 on 2026-12-03
 * so a tab that starts reading per row fails here. Lower one when a tab improves.
 */
const TAB_BUDGETS: Record<string, number> = {
	script: 10,
	'script/<segment>': 8,
	rundown: 8,
	'rundown/<segment>': 8,
	shots: 8,
	// The edit page also reads the segments' spans in the cut (caution checks), the footage page
	// each clip's media outputs (proxy, thumbnails, waveform): one query each, not one per row.
	// The current cut version comes with its open comments and its peaks job (the Sound lane)
	// in the same query.
	edit: 12,
	footage: 6,
	notes: 6,
	parts: 8,
	publish: 3,
	'spec-cards': 5,
	// Versions, their comments with replies, and the crew for mentions: one query each.
	screening: 8
};
const ROLES = ['producer', 'host', 'camera', 'editor', 'merch'] as const;

let database: pg.Pool;
let server: ChildProcess;
let base = '';
const cookies = new Map<string, string>();
let episodeId = '';
let segmentId = '';

/** The number of queries a GET made, from X-Query-Count; fails on anything but 200. */
async function queriesFor(role: (typeof ROLES)[number], path: string, json = false) {
	const response = await fetch(base + path, {
		headers: { cookie: cookies.get(role)!, accept: json ? 'application/json' : 'text/html' },
		redirect: 'manual'
	});
	const body = await response.text();
	expect(response.status, `${role} GET ${path}: ${body.slice(0, 300)}`).toBe(200);
	const count = response.headers.get('x-query-count');
	expect(count, `${path} has no X-Query-Count`).not.toBeNull();
	return Number(count);
}

const homeCounts = async () =>
	Object.fromEntries(
		await Promise.all(ROLES.map(async (role) => [role, await queriesFor(role, '/')] as const))
	);

let homeAtOne: Record<string, number> = {};
/** Where the server appends each request's statements (WRENCHROLL_RECORD_QUERIES). */
const recordingDir = mkdtempSync(path.join(tmpdir(), 'wrenchroll-query-record-'));
const recording = path.join(recordingDir, 'statements.jsonl');

beforeAll(async () => {
	const url = await scratchDatabase(DATABASE, ['scripts/migrate.ts', 'scripts/seed.ts']);
	database = new pg.Pool({ connectionString: url, max: 2 });
	const port = await freePort();
	base = `http://127.0.0.1:${port}`;
	server = startServer({
		...inject('serverEnv'),
		PORT: String(port),
		ORIGIN: base,
		DATABASE_URL: url,
		WRENCHROLL_COUNT_QUERIES: '1',
		WRENCHROLL_RECORD_QUERIES: recording
	});
	await waitForHttp(`${base}/healthz`, 30_000);
	for (const role of ROLES) cookies.set(role, await signInCookie(base, demo[role]));

	// The Torquehaven episode with the most work on it: the one grown inside itself.
	const [episode] = (
		await database.query<{ id: string; channelId: string }>(
			`SELECT e.id, e.channel_id AS "channelId" FROM episode e JOIN channel c ON c.id = e.channel_id
			 WHERE c.name = 'Torquehaven Garage'
			 ORDER BY (SELECT count(*) FROM segment s WHERE s.episode_id = e.id)
			        + (SELECT count(*) FROM segment_note n WHERE n.episode_id = e.id) DESC, e.created_at
			 LIMIT 1`
		)
	).rows;
	episodeId = episode.id;
	// The editor is on two channels and last chose the other one: the episode link switches them
	// here (a 303 that sets the channel cookie), as a link from a mail would.
	await followChannelSwitch('editor', `/episodes/${episodeId}`);
	homeAtOne = await homeCounts();
	const before = await counts(episode.channelId);
	await scaleDemo(database, episode.channelId, FACTOR, episodeId);
	const after = await counts(episode.channelId);
	// The scaling really happened: ×50 episodes in the channel, ×50 segments in the episode.
	expect(after.episodes).toBe(before.episodes * FACTOR);
	expect(after.segments).toBe(before.segments * FACTOR);
	expect(after.notes).toBeGreaterThanOrEqual(before.notes * FACTOR);
	segmentId = (
		await database.query<{ id: string }>(
			`SELECT id FROM segment WHERE episode_id = $1 ORDER BY position LIMIT 1`,
			[episodeId]
		)
	).rows[0].id;
}, 180_000);

async function followChannelSwitch(role: (typeof ROLES)[number], path: string) {
	const response = await fetch(base + path, {
		headers: { cookie: cookies.get(role)!, accept: 'text/html' },
		redirect: 'manual'
	});
	await response.text();
	const jar = new Map(
		cookies
			.get(role)!
			.split('; ')
			.map((pair) => pair.split('=', 2) as [string, string])
	);
	for (const line of response.headers.getSetCookie()) {
		const [pair] = line.split(';');
		const at = pair.indexOf('=');
		jar.set(pair.slice(0, at), pair.slice(at + 1));
	}
	cookies.set(role, [...jar].map(([name, value]) => `${name}=${value}`).join('; '));
}

async function counts(channelId: string) {
	const [row] = (
		await database.query<{ episodes: number; segments: number; notes: number }>(
			`SELECT (SELECT count(*)::int FROM episode WHERE channel_id = $1) AS episodes,
			        (SELECT count(*)::int FROM segment WHERE episode_id = $2) AS segments,
			        (SELECT count(*)::int FROM segment_note WHERE episode_id = $2) AS notes`,
			[channelId, episodeId]
		)
	).rows;
	return row;
}

afterAll(async () => {
	if (server) await stopServer(server);
	await database?.end();
	await dropScratchDatabase(DATABASE);
	rmSync(recordingDir, { recursive: true, force: true });
});

describe('at ×50 demo data', () => {
	test.each(ROLES)(
		`the episode page makes at most ${EPISODE_BUDGET} queries for the %s`,
		async (role) => {
			expect(await queriesFor(role, `/episodes/${episodeId}`)).toBeLessThanOrEqual(EPISODE_BUDGET);
		}
	);

	test.each(ROLES)(
		`GET /api/episodes/<id> makes at most ${EPISODE_BUDGET} queries for the %s`,
		async (role) => {
			expect(await queriesFor(role, `/api/episodes/${episodeId}`, true)).toBeLessThanOrEqual(
				EPISODE_BUDGET
			);
		}
	);

	test.each(Object.entries(TAB_BUDGETS))(
		'the episode tab %s stays within %i queries (producer)',
		async (tab, budget) => {
			const path = `/episodes/${episodeId}/${tab.replace('<segment>', segmentId)}`;
			expect(await queriesFor('producer', path)).toBeLessThanOrEqual(budget);
		}
	);

	test('the home page makes as many queries at ×50 as at ×1, for every role', async () => {
		expect(await homeCounts()).toEqual(homeAtOne);
	});

	test('the recording the episode bench replays holds each statement a request sent, the reads compiled once named', async () => {
		const pathname = `/api/episodes/${episodeId}`;
		const count = await queriesFor('producer', pathname, true);
		const lines = readFileSync(recording, 'utf8').trim().split('\n');
		const last = JSON.parse(lines.at(-1)!) as {
			method: string;
			path: string;
			statements: { sql: string; parameters: unknown[]; named: boolean }[];
		};
		expect(last).toMatchObject({ method: 'GET', path: pathname });
		expect(last.statements).toHaveLength(count);
		// Who is calling, the episode and its gate materials: the three reads compiled once.
		expect(last.statements.filter((statement) => statement.named)).toHaveLength(3);
		expect(last.statements[0].sql).toContain('person_session');
		for (const statement of last.statements) {
			expect(statement.sql).toMatch(/^select /i);
			// Each with the values it ran with: the session's id, then the episode's.
			expect(statement.parameters).toEqual(
				expect.arrayContaining([statement === last.statements[0] ? expect.any(String) : episodeId])
			);
		}
	});
});
