/** Demo chapters and cut lengths for the demo episodes (filled in with the edit work). */
import type { Transaction } from 'kysely';
import type { Database } from '../../src/lib/server/db/types.ts';
import type { SeedContext } from './seed-context.ts';

export async function seedEdit(_trx: Transaction<Database>, _context: SeedContext): Promise<void> {}
