/** npm run seed: writes the demo world into DATABASE_URL (or the embedded cluster) when it is empty. */
import { migrateToLatest } from './lib/migrator.ts';
import { seedDemo } from './lib/seed.ts';
import { scriptDatabase } from './lib/script-database.ts';

const { url, done } = await scriptDatabase();
await migrateToLatest(url);
const outcome = await seedDemo(url);
console.log(
	outcome === 'seeded'
		? 'demo data written'
		: 'the database already has channels: demo data not written again'
);
// Leave a cluster that npm start is using alone; stop one this script started.
done();
