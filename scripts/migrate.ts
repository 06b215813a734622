/** npm run migrate: migrates DATABASE_URL, or the embedded cluster when DATABASE_URL is unset. */
import { migrateToLatest } from './lib/migrator.ts';
import { scriptDatabase } from './lib/script-database.ts';

const { url, done } = await scriptDatabase();
await migrateToLatest(url);
console.log('database is up to date');
// Leave a cluster that npm start is using alone; stop one this script started.
done();
