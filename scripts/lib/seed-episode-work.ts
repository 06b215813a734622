/** Demo rundowns, scripts, cautions and follow-ups for the demo episodes (filled in with the episodes work). */
import type { Transaction } from 'kysely';
import type { Database } from '../../src/lib/server/db/types.ts';
import type { SeedContext } from './seed-context.ts';

export async function seedEpisodeWork(_trx: Transaction<Database>, _context: SeedContext): Promise<void> {}
