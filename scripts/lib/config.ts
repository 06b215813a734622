/** Settings shared by the launcher, migrate and seed scripts: one place for the embedded defaults. */
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const projectRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
/** A fixed, non-default port so the embedded cluster never collides with a system PostgreSQL on 5432. */
export const EMBEDDED_PG_PORT = Number(process.env.WRENCHROLL_PG_PORT ?? 54329);
export const EMBEDDED_PG_DIR = path.join(projectRoot, '.data', 'postgres');
export const EMBEDDED_DATABASE = 'wrenchroll';
