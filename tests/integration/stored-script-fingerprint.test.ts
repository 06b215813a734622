/**
 * The episode's stored script fingerprint (`episode.script_fingerprint`, kept by the database's
 * triggers, migrations/2026-12-04-30-stored-script-fingerprint.ts) stays equal to the fingerprint
 * of the script as saved, after every kind of write: through the app's own routes (a new segment,
 * a script saved, the rundown reordered, a segment deleted) and by plain SQL (several rows in one
 * statement, a segment moved to another episode, a script row removed, an episode deleted).
 *
 * Outside source for the checks: SHA-256 (FIPS 180-4) computed by Node.js's `node:crypto` over the
 * bytes the fingerprint is defined on (each segment's id, NUL, its text, SOH, in rundown order;
 * tests/REFERENCES.md "Database and text"), read back from the tables, never from the column itself.
 */
import { createHash } from 'node:crypto';
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import { saveScript } from '../helpers/scripts';

let channelId: string;
let producer: Visitor;

/** FIPS 180-4 SHA-256 by node:crypto over the episode's script rows, in rundown order. */
async function expectedFingerprint(episodeId: string): Promise<string> {
	const rows = await sql<{ id: string; body: string }>(
		`SELECT s.id, ss.body FROM segment s JOIN segment_script ss ON ss.segment_id = s.id
		 WHERE s.episode_id = $1 ORDER BY s.position`,
		[episodeId]
	);
	const hash = createHash('sha256');
	for (const row of rows) hash.update(`${row.id}\u0000${row.body}\u0001`);
	return hash.digest('hex');
}

async function stored(episodeId: string): Promise<string | undefined> {
	const [row] = await sql<{ script_fingerprint: string }>(
		`SELECT script_fingerprint FROM episode WHERE id = $1`,
		[episodeId]
	);
	return row?.script_fingerprint;
}

/** The stored fingerprint equals the one computed from the rows, and differs from `before` when given. */
async function expectTrue(episodeId: string, before?: string): Promise<string> {
	const now = await stored(episodeId);
	expect(now).toBe(await expectedFingerprint(episodeId));
	if (before !== undefined) expect(now).not.toBe(before);
	return now!;
}

async function newEpisode(label: string): Promise<string> {
	const slug = `fingerprint-${label}-${Date.now()}`;
	const [episode] = await sql<{ id: string }>(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage)
		 VALUES ($1, $2, $3, 600, '29.97', 'script') RETURNING id`,
		[channelId, `Fingerprint ${label}`, slug]
	);
	return episode.id;
}

async function addSegment(episodeId: string, title: string): Promise<string> {
	const made = await producer.api(`/api/episodes/${episodeId}/segments`, {
		method: 'POST',
		json: { kind: 'install-step', title, plannedSeconds: 45 }
	});
	expect(made.status).toBe(201);
	return made.body.segment.id;
}

beforeAll(async () => {
	[{ id: channelId }] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	producer = await signedIn(demo.producer);
});

describe('the stored script fingerprint follows every write', () => {
	test('every demo episode already holds the fingerprint of its script (the migration filled them)', async () => {
		const episodes = await sql<{ id: string }>(`SELECT id FROM episode`);
		expect(episodes.length).toBeGreaterThan(3);
		for (const { id } of episodes) expect(await stored(id), id).toBe(await expectedFingerprint(id));
	});

	test('through the app: add, save, reorder, delete', async () => {
		const episode = await newEpisode('app');
		// No script rows at all: SHA-256 of nothing (node:crypto over zero bytes).
		let last = await expectTrue(episode);
		expect(last).toBe(createHash('sha256').digest('hex'));

		const jack = await addSegment(episode, 'Jack and stands');
		const spring = await addSegment(episode, 'Spring out');
		last = await expectTrue(episode, last);
		await saveScript(producer, jack, 'Chock the rear wheels, then lift at the frame rail.');
		last = await expectTrue(episode, last);
		await saveScript(
			producer,
			spring,
			'Compress the spring with a rated compressor before the top mount.'
		);
		last = await expectTrue(episode, last);
		// The same text saved again changes nothing.
		await saveScript(
			producer,
			spring,
			'Compress the spring with a rated compressor before the top mount.'
		);
		expect(await expectTrue(episode)).toBe(last);

		const reordered = await producer.api(`/api/episodes/${episode}/segments/order`, {
			method: 'PUT',
			json: { order: [spring, jack] }
		});
		expect(reordered.status).toBe(200);
		last = await expectTrue(episode, last);

		const [{ version }] = await sql(`SELECT version FROM segment WHERE id = $1`, [jack]);
		const deleted = await producer.api(`/api/segments/${jack}`, {
			method: 'DELETE',
			json: { version }
		});
		expect(deleted.status).toBe(200);
		last = await expectTrue(episode, last);

		// What the script page offers to approve is the stored fingerprint.
		const state = (await producer.api(`/api/episodes/${episode}/script-review`)).body;
		expect(state.fingerprint).toBe(last);
	});

	test('by plain SQL: many rows at once, a segment moved between episodes, rows removed', async () => {
		const first = await newEpisode('sql-a');
		const second = await newEpisode('sql-b');
		const segments = await sql<{ id: string }>(
			`INSERT INTO segment (episode_id, position, kind, title)
			 SELECT $1, p, 'install-step', 'Step ' || p FROM generate_series(1, 4) AS p RETURNING id`,
			[first]
		);
		let a = await expectTrue(first);
		await sql(
			`INSERT INTO segment_script (segment_id, body)
			 SELECT id, 'Torque to spec, step ' || row_number() OVER () FROM unnest($1::uuid[]) AS id`,
			[segments.map((segment) => segment.id)]
		);
		a = await expectTrue(first, a);
		// Every text in one statement.
		await sql(`UPDATE segment_script SET body = body || ' (checked)' WHERE segment_id = ANY($1)`, [
			segments.map((segment) => segment.id)
		]);
		a = await expectTrue(first, a);
		// An update that touches neither text nor order leaves it as it was.
		await sql(`UPDATE segment SET planned_seconds = 90 WHERE episode_id = $1`, [first]);
		expect(await expectTrue(first)).toBe(a);
		// Positions swapped in one statement.
		await sql(
			`UPDATE segment SET position = CASE position WHEN 1 THEN 2 WHEN 2 THEN 1 ELSE position END
			 WHERE episode_id = $1`,
			[first]
		);
		a = await expectTrue(first, a);
		// A segment moved to the other episode changes both.
		let b = await expectTrue(second);
		await sql(`UPDATE segment SET episode_id = $1, position = 1 WHERE id = $2`, [
			second,
			segments[3].id
		]);
		a = await expectTrue(first, a);
		b = await expectTrue(second, b);
		// A script row removed without its segment.
		await sql(`DELETE FROM segment_script WHERE segment_id = $1`, [segments[0].id]);
		a = await expectTrue(first, a);
		// Segments removed (their script rows go with them).
		await sql(`DELETE FROM segment WHERE episode_id = $1`, [first]);
		a = await expectTrue(first, a);
		expect(a).toBe(createHash('sha256').digest('hex'));
		// Deleting the episode itself, segments and all, is no trouble for the triggers.
		await sql(`DELETE FROM episode WHERE id = $1`, [second]);
		expect(await stored(second)).toBeUndefined();
		expect(b).not.toBe(a);
	});
});

/**
 * The gate's spoken-word counts are remembered per episode with the fingerprint they were counted
 * from, and the query sends the script's text only when the stored fingerprint differs: so an edit,
 * however it is made, must still reach the gate on the next read.
 */
describe('the gate reads the script as saved now', () => {
	const rules = async (episodeId: string) =>
		(await producer.api(`/api/episodes/${episodeId}`)).body.stage.reasons.map(
			(reason: { rule: string }) => reason.rule
		);

	test('empty, written, read again, emptied by plain SQL: the "no script" reason follows each', async () => {
		const episode = await newEpisode('gate');
		const segment = await addSegment(episode, 'Torque the lug nuts');
		expect(await rules(episode)).toContain('script-empty');
		expect(await rules(episode)).toContain('script-empty');
		await saveScript(
			producer,
			segment,
			'Snug each nut by hand, then torque them across the hub in two passes.'
		);
		expect(await rules(episode)).not.toContain('script-empty');
		// Read again unchanged (the counts remembered, the text not sent): still written.
		expect(await rules(episode)).not.toContain('script-empty');
		// Changed behind the app's back: the stored fingerprint moves, so the text is sent again.
		await sql(`UPDATE segment_script SET body = '' WHERE segment_id = $1`, [segment]);
		expect(await rules(episode)).toContain('script-empty');
		await sql(
			`UPDATE segment_script SET body = 'Torque to the figure in the service manual.' WHERE segment_id = $1`,
			[segment]
		);
		expect(await rules(episode)).not.toContain('script-empty');
	});
});
