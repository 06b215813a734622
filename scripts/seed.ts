/** npm run seed: writes the demo world into DATABASE_URL (or the embedded cluster) when it is empty. */
import { migrateToLatest } from './lib/migrator.ts';
import { startCluster } from './lib/postgres.ts';
import { seedDemo } from './lib/seed.ts';
import { EMBEDDED_DATABASE, EMBEDDED_PG_DIR, EMBEDDED_PG_PORT } from './lib/config.ts';

const cluster = process.env.DATABASE_URL
	? null
	: await startCluster({
			dataDir: EMBEDDED_PG_DIR,
			port: EMBEDDED_PG_PORT,
			database: EMBEDDED_DATABASE
		});
const url = process.env.DATABASE_URL ?? cluster!.url;
await migrateToLatest(url);
const outcome = await seedDemo(url);
console.log(
	outcome === 'seeded'
		? 'demo data written'
		: 'the database already has channels: demo data not written again'
);
// Leave a cluster that npm start is using alone; stop one this script started.
if (cluster?.startedHere) cluster.stop();
