/**
 * What the database itself guarantees about frame rates and foreign-key indexes (migration
 * 2026-12-03-01), checked on the throwaway cluster the real migrate and seed scripts built.
 *
 * Outside sources for the checks:
 * - PostgreSQL documentation, "Check Constraints" (a row that fails a CHECK is refused with
 *   SQLSTATE 23514, check_violation, naming the constraint) and "Foreign Keys" (the referencing
 *   columns are not indexed automatically; deleting a referenced row searches them), read from the
 *   server's own catalogs: pg_indexes, pg_constraint, pg_attribute.
 * - The programme frame rates are the FrameRate union of $lib/timecode (SMPTE ST 12-1 rates and
 *   their NTSC-family labels, REFERENCES.md); the check must allow exactly those.
 * - 120 fps as a slow-motion capture rate: common practice.
 */
import pg from 'pg';
import { beforeAll, describe, expect, inject, test } from 'vitest';
import { demo, signedIn, sql, type Visitor } from '../helpers/http';
import { FRAME_RATES, formatTimecode, type FrameRate } from '$lib/timecode';

/** Near misses a person or an import could write: a drop-frame typo, a comma, a unit, padding. */
const NOT_RATES = ['29.976', '29,97', '30 fps', '030', '', '23.98', '59.94 DF', '120'];

/** Runs statements in a transaction that is always rolled back, so the shared demo is untouched. */
async function rolledBack<T>(work: (client: pg.Client) => Promise<T>): Promise<T> {
	const client = new pg.Client({ connectionString: inject('databaseUrl') });
	await client.connect();
	try {
		await client.query('BEGIN');
		return await work(client);
	} finally {
		await client.query('ROLLBACK').catch(() => undefined);
		await client.end();
	}
}

/**
 * The error PostgreSQL answers a statement with, or null when it succeeded. Rolled back either
 * way, so a missing check can't leave a bad rate behind for the other test files.
 */
async function refusal(text: string, params: unknown[]) {
	return rolledBack(async (client) => {
		try {
			await client.query(text, params);
			return null;
		} catch (failure) {
			return failure as { code?: string; constraint?: string };
		}
	});
}

let episode: { id: string; frameRate: string; cut: number | null };
let footageId: string;

beforeAll(async () => {
	[episode] = await sql(
		`SELECT e.id, e.frame_rate AS "frameRate", e.cut_duration_frames AS cut
		   FROM episode e JOIN channel c ON c.id = e.channel_id
		  WHERE c.name = 'Torquehaven Garage' AND e.cut_duration_frames IS NOT NULL
		    AND e.stage <> 'published'
		  ORDER BY e.created_at LIMIT 1`
	);
	[{ id: footageId }] = await sql(`SELECT id FROM footage LIMIT 1`);
});

describe('the database refuses a frame rate the app does not offer', () => {
	const columns = [
		['channel', 'channel_frame_rate_known'],
		['episode', 'episode_frame_rate_known'],
		['recording_profile', 'recording_profile_frame_rate_known']
	] as const;

	test.each(columns)('%s.frame_rate refuses near misses (check %s)', async (table, constraint) => {
		const [row] = await sql<{ id: string; frame_rate: string }>(
			`SELECT id, frame_rate FROM ${table} LIMIT 1`
		);
		for (const value of NOT_RATES) {
			const failure = await refusal(`UPDATE ${table} SET frame_rate = $1 WHERE id = $2`, [
				value,
				row.id
			]);
			// PostgreSQL docs: a failed CHECK is SQLSTATE 23514 and names the constraint.
			expect(failure, `${table}.frame_rate = ${JSON.stringify(value)}`).toMatchObject({
				code: '23514',
				constraint
			});
		}
		const [after] = await sql(`SELECT frame_rate FROM ${table} WHERE id = $1`, [row.id]);
		expect(after.frame_rate).toBe(row.frame_rate);
	});

	test.each(columns)('%s.frame_rate takes every rate of the FrameRate type', async (table) => {
		await rolledBack(async (client) => {
			const {
				rows: [row]
			} = await client.query(`SELECT id FROM ${table} LIMIT 1`);
			for (const rate of FRAME_RATES) {
				const result = await client.query(
					`UPDATE ${table} SET frame_rate = $1 WHERE id = $2 RETURNING frame_rate`,
					[rate, row.id]
				);
				expect(result.rows[0].frame_rate).toBe(rate);
			}
		});
	});

	test('a new episode with a typo in its rate is refused, and no row is written', async () => {
		const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
		const failure = await refusal(
			`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate)
			 VALUES ($1, 'Rate typo', 'rate-typo-check', 600, '29.976')`,
			[channel.id]
		);
		expect(failure).toMatchObject({ code: '23514', constraint: 'episode_frame_rate_known' });
		expect(await sql(`SELECT id FROM episode WHERE slug = 'rate-typo-check'`)).toHaveLength(0);
	});

	test('footage keeps a measured rate such as 120 fps, or none, but not free text', async () => {
		await rolledBack(async (client) => {
			for (const measured of ['120', '119.88', '29.97', null]) {
				const result = await client.query(
					`UPDATE footage SET frame_rate = $1 WHERE id = $2 RETURNING frame_rate`,
					[measured, footageId]
				);
				expect(result.rows[0].frame_rate).toBe(measured);
			}
		});
		for (const text of ['29.97 fps', 'fast', '-30', '29.9700', '']) {
			const failure = await refusal(`UPDATE footage SET frame_rate = $1 WHERE id = $2`, [
				text,
				footageId
			]);
			expect(failure, JSON.stringify(text)).toMatchObject({
				code: '23514',
				constraint: 'footage_frame_rate_measured'
			});
		}
	});
});

describe('foreign keys the app walks have an index', () => {
	/** [table, column]: a query filters by it, or deleting the parent row searches it. */
	const walked: [string, string][] = [
		['gear_item', 'shoot_day_id'],
		['pull_item', 'shoot_day_id'],
		['shoot_day_camera', 'shoot_day_id'],
		['segment_note', 'segment_id'],
		['shoot_day', 'episode_id'],
		['footage', 'shoot_day_id'],
		['upload', 'shoot_day_id'],
		['script_review', 'segment_id'],
		['shoot_day_segment', 'segment_id'],
		['shoot_day_camera', 'profile_id'],
		['pull_item', 'part_id'],
		['take', 'footage_id'],
		['episode_build', 'build_id'],
		['recording_profile', 'channel_id']
	];

	test.each(walked)('%s.%s leads an index (pg_indexes)', async (table, column) => {
		const indexes = await sql<{ indexdef: string }>(
			`SELECT indexdef FROM pg_indexes WHERE schemaname = 'public' AND tablename = $1`,
			[table]
		);
		// indexdef reads "CREATE INDEX name ON public.table USING btree (first, …)".
		const leading = indexes.map((index) => index.indexdef.match(/USING \w+ \(([a-z_]+)/)?.[1]);
		expect(leading).toContain(column);
	});

	test('every other foreign key without an index points at rows the app never deletes', async () => {
		// A foreign key is "indexed" when some index starts with exactly its columns. Only our own
		// schema: the job queue's tables (schema pgboss) are pg-boss's to index.
		const unindexed = await sql<{ key: string }>(
			`SELECT c.conrelid::regclass || '.' || a.attname || ' -> ' || c.confrelid::regclass AS key
			   FROM pg_constraint c
			   JOIN pg_attribute a ON a.attrelid = c.conrelid AND a.attnum = c.conkey[1]
			  WHERE c.contype = 'f' AND cardinality(c.conkey) = 1
			    AND c.connamespace = 'public'::regnamespace
			    AND NOT EXISTS (SELECT 1 FROM pg_index i
			                     WHERE i.indrelid = c.conrelid AND i.indkey[0] = c.conkey[1])
			  ORDER BY 1`
		);
		const parents = new Set(unindexed.map((row) => row.key.split(' -> ')[1]));
		// Channels, people, builds and episodes are never deleted by the app (no delete path in
		// src/lib/server), and no query filters by these columns alone.
		expect([...parents].sort()).toEqual(['build', 'channel', 'episode', 'person']);
	});
});

describe('everything still reads back after the migration', () => {
	let producer: Visitor;
	beforeAll(async () => {
		producer = await signedIn(demo.producer);
	});

	test('the seeded rates are all programme rates', async () => {
		for (const table of ['channel', 'episode', 'recording_profile']) {
			const rows = await sql<{ frame_rate: string }>(`SELECT DISTINCT frame_rate FROM ${table}`);
			expect(rows.length).toBeGreaterThan(0);
			for (const row of rows) expect(FRAME_RATES).toContain(row.frame_rate);
		}
	});

	test('the segment page shows the episode’s own rate and cut, with no fallback rate', async () => {
		// A segment with a caution card, where the page says how long the cut runs (of an episode not
		// yet published: publishing fixes the cards, and their forms are gone then).
		const [segment] = await sql(
			`SELECT s.id FROM segment s WHERE s.episode_id = $1
			    AND EXISTS (SELECT 1 FROM caution c WHERE c.segment_id = s.id) LIMIT 1`,
			[episode.id]
		);
		const response = await producer.request(`/episodes/${episode.id}/rundown/${segment.id}`);
		expect(response.status).toBe(200);
		const html = await response.text();
		expect(html).toContain(`Length (${episode.frameRate} fps)`);
		expect(html).toContain(
			`The cut runs ${formatTimecode(episode.cut!, episode.frameRate as FrameRate)}`
		);
	});

	test('the edit, the shoot day, the footage list and the channel read their rates', async () => {
		const edit = await producer.api(`/api/episodes/${episode.id}/chapters`);
		expect(edit.status).toBe(200);
		expect(JSON.stringify(edit.body)).toContain(`"frameRate":"${episode.frameRate}"`);

		const [day] = await sql(
			`SELECT d.id, p.frame_rate FROM shoot_day d
			   JOIN shoot_day_camera k ON k.shoot_day_id = d.id
			   JOIN recording_profile p ON p.id = k.profile_id LIMIT 1`
		);
		const shootDay = await producer.api(`/api/shoot-days/${day.id}`);
		expect(shootDay.status).toBe(200);
		expect(
			shootDay.body.cameras.map((camera: { frameRate: string }) => camera.frameRate)
		).toContain(day.frame_rate);

		const [clip] = await sql(`SELECT episode_id, frame_rate FROM footage WHERE id = $1`, [
			footageId
		]);
		const footage = await producer.api(`/api/episodes/${clip.episode_id}/footage`);
		expect(footage.status).toBe(200);
		expect(footage.body.footage.find((row: { id: string }) => row.id === footageId).frameRate).toBe(
			clip.frame_rate
		);

		const channel = await producer.api('/api/channel');
		expect(channel.status).toBe(200);
		expect(FRAME_RATES).toContain(channel.body.channel.frameRate);
	});
});
