/**
 * Storage view benchmark (not a test): GET /api/storage for a channel with 10,000 episodes,
 * measured on this machine. Prints a table and exits 1 when a target is missed.
 *
 *   npm run build && node_modules/.bin/tsx scripts/bench-storage.ts
 *   (WRENCHROLL_BUILD_DIR picks another build folder, as for the tests)
 *
 * It opens a bench world (throwaway PostgreSQL with pg_stat_statements, the real migrate and seed,
 * the built server), adds 10,000 episodes to the demo channel with three clips each (two rushes,
 * one cut), four made files per clip and an unfinished upload on every tenth episode, a third of
 * them published long ago, signs in as the demo producer and asks for the view 50 times after 10
 * warm-up requests (first page and a later page, alternately).
 * Targets: median API time under 250 ms (our own target for a page a producer opens now and then),
 * and one statement reading footage per request (counted with pg_stat_statements).
 */
import pg from 'pg';
import { openBenchWorld, signedInSession } from './lib/bench-world.ts';

const EPISODES = 10_000;
const WARM_UP = 10;
const MEASURED = 50;
const MEDIAN_TARGET_MS = 250;
const QUERY_TARGET = 1;

const percentile = (samples: number[], fraction: number) => {
	const sorted = [...samples].sort((a, b) => a - b);
	return sorted[Math.max(0, Math.ceil(fraction * sorted.length) - 1)];
};

async function addEpisodes(pool: pg.Pool, channelId: string) {
	const [{ id: personId }] = (
		await pool.query(`SELECT person_id AS id FROM membership WHERE channel_id = $1 LIMIT 1`, [
			channelId
		])
	).rows;
	await pool.query(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, publish_date)
		 SELECT $1, 'Bench episode ' || i, 'bench-storage-' || i, 600, '29.97',
			CASE WHEN i % 3 = 0 THEN 'published' ELSE 'edit' END,
			CASE WHEN i % 3 = 0 THEN current_date - (i % 90) ELSE NULL END
		 FROM generate_series(1, ${EPISODES}) i`,
		[channelId]
	);
	await pool.query(
		`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, clip_name, file_name, file_type, size_bytes, sha256)
		 SELECT $1, e.id, e.id::text || '-' || c, CASE WHEN c < 3 THEN 'footage' ELSE 'cut' END,
			'clip', 'clip.mp4', 'video/mp4', (1 + (hashtext(e.id::text || c) & 1023)) * 1000000, repeat('0', 64)
		 FROM episode e CROSS JOIN generate_series(1, 3) c
		 WHERE e.channel_id = $1 AND e.slug LIKE 'bench-storage-%'`,
		[channelId]
	);
	await pool.query(
		`INSERT INTO media_output (footage_id, kind, state, bytes)
		 SELECT f.id, k, 'done', f.size_bytes / 20
		 FROM footage f CROSS JOIN unnest(ARRAY['proxy', 'poster', 'sprite', 'peaks']) k
		 WHERE f.channel_id = $1`,
		[channelId]
	);
	await pool.query(
		`INSERT INTO upload (id, channel_id, person_id, episode_id, purpose, clip_name, file_name, file_type, size_bytes)
		 SELECT md5(e.id::text), $1, $2, e.id, 'footage', 'clip', 'clip.mp4', 'video/mp4', 500000000
		 FROM episode e WHERE e.channel_id = $1 AND e.slug LIKE 'bench-storage-%' AND hashtext(e.slug) % 10 = 0`,
		[channelId, personId]
	);
	await pool.query('ANALYZE');
}

async function main() {
	const world = await openBenchWorld('bench-storage');
	let ok: boolean;
	try {
		const pool = world.pool;
		const [{ id: channelId }] = (
			await pool.query(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`)
		).rows;
		const filled = performance.now();
		await addEpisodes(pool, channelId);
		console.log(
			`Added ${EPISODES.toLocaleString('en')} episodes with clips and made files in ${((performance.now() - filled) / 1000).toFixed(1)} s.`
		);
		const baseUrl = await world.startServer();
		console.log(
			`Wrenchroll storage bench on ${process.platform} ${process.arch}, Node ${process.version}, built server ${world.buildDir}`
		);
		const session = await signedInSession(baseUrl, 'dana@torquehaven.test');
		const first = await session.get('/api/storage');
		if (first.status !== 200) throw new Error(`GET /api/storage answered ${first.status}`);
		const later = `/api/storage?after=${encodeURIComponent(JSON.parse(first.body).next)}`;
		for (let i = 0; i < WARM_UP; i++) await session.get(i % 2 ? later : '/api/storage');

		await pool.query('SELECT pg_stat_statements_reset()');
		const times: number[] = [];
		for (let i = 0; i < MEASURED; i++) {
			const answer = await session.get(i % 2 ? later : '/api/storage');
			if (answer.status !== 200) throw new Error(`GET /api/storage answered ${answer.status}`);
			times.push(answer.wallMilliseconds);
		}
		const statements = (
			await pool.query<{ query: string; calls: number }>(
				`SELECT query, calls::int AS calls FROM pg_stat_statements
				 WHERE dbid = (SELECT oid FROM pg_database WHERE datname = current_database())
					AND query ILIKE '%footage%' AND query NOT ILIKE '%pg_stat_statements%'`
			)
		).rows;
		const perRequest = statements.reduce((sum, row) => sum + row.calls, 0) / MEASURED;
		const median = percentile(times, 0.5);
		console.log(
			`\nGET /api/storage, ${EPISODES.toLocaleString('en')} episodes, ${MEASURED} requests`
		);
		console.log(
			`  median ${median.toFixed(1)} ms, p95 ${percentile(times, 0.95).toFixed(1)} ms (target: median under ${MEDIAN_TARGET_MS} ms)`
		);
		console.log(
			`  statements reading footage per request: ${perRequest.toFixed(2)} (target: at most ${QUERY_TARGET})`
		);
		ok = median < MEDIAN_TARGET_MS && perRequest <= QUERY_TARGET;
		console.log(`\n${ok ? 'all targets met' : 'TARGET MISSED'}\n`);
	} finally {
		await world.close();
	}
	process.exit(ok ? 0 : 1);
}

await main();
