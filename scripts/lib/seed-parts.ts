/** Demo data for the parts work (filled in with that work). */
import type { Transaction } from 'kysely';
import type { Database } from '../../src/lib/server/db/types.ts';
import type { SeedContext } from './seed-context.ts';

export async function seedParts(_trx: Transaction<Database>, _context: SeedContext): Promise<void> {}
