/**
 * npm run bench:seed: the demo channel at a real channel's size, so anyone can reproduce the
 * benchmark figures: Torquehaven Garage gets 10,000 episodes (the demo's copied with all their
 * work), one of them with 10,000 chapters, and 200,000 catalogue parts of fictional brands.
 * Writes into DATABASE_URL or the embedded cluster (as npm run seed), migrating and seeding the
 * demo first when the database is empty; a channel already at that size is left alone.
 */
import pg from 'pg';
import { migrateToLatest } from './lib/migrator.ts';
import { seedDemo } from './lib/seed.ts';
import { scriptDatabase } from './lib/script-database.ts';
import { fillBenchChannel } from './lib/scale-data.ts';

const { url, done } = await scriptDatabase();
await migrateToLatest(url);
await seedDemo(url);
const pool = new pg.Pool({ connectionString: url, max: 1 });
try {
	const outcome = await fillBenchChannel(pool, 'Torquehaven Garage');
	const sizes = (
		await pool.query<{ table: string; rows: number }>(
			`SELECT 'episodes' AS table, count(*)::int AS rows FROM episode
			 UNION ALL SELECT 'segments', count(*)::int FROM segment
			 UNION ALL SELECT 'parts', count(*)::int FROM part
			 UNION ALL SELECT 'chapters', count(*)::int FROM chapter
			 UNION ALL SELECT 'segment notes', count(*)::int FROM segment_note`
		)
	).rows;
	console.log(
		outcome.alreadyFilled
			? 'Torquehaven Garage already has bench-size data: nothing written.'
			: `Bench-size data written in ${outcome.seconds.toFixed(1)} s.`
	);
	for (const { table, rows } of sizes)
		console.log(`  ${table.padEnd(14)} ${rows.toLocaleString('en').padStart(9)}`);
} finally {
	await pool.end();
	done();
}
