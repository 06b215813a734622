/**
 * Telling "PostgreSQL is out of reach" apart from every other failure, so the app can answer 503
 * (try again later) instead of 500, and a cheap health check of the database for /healthz.
 */
import { sql } from 'kysely';
import { db } from './index';

/** Socket errors meaning the server could not be reached or dropped the connection. */
const NETWORK_CODES = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'EPIPE',
	'ETIMEDOUT',
	'EHOSTUNREACH',
	'ENETUNREACH',
	'ENOTFOUND',
	'EAI_AGAIN'
]);

/**
 * PostgreSQL error codes (SQLSTATE, PostgreSQL manual, Appendix A) that mean the server is not
 * serving: class 08 connection exceptions, 57P01–57P03 shutdown and start-up, 53300 too many
 * connections.
 */
const SERVER_GONE = /^(08...|57P0[123]|53300)$/;

/** Messages of node-postgres (pg, pg-pool) for a connection that never came or broke. */
const DRIVER_MESSAGES = [
	'timeout exceeded when trying to connect',
	'Connection terminated',
	'Client has encountered a connection error and is not queryable'
];

/** Whether a failure means the database could not be reached, rather than a fault in the request. */
export function isDatabaseUnavailable(failure: unknown, depth = 0): boolean {
	if (!failure || typeof failure !== 'object' || depth > 4) return false;
	const { code, message, cause, errors, err } = failure as {
		code?: unknown;
		message?: unknown;
		cause?: unknown;
		errors?: unknown;
		err?: unknown;
	};
	if (typeof code === 'string' && (NETWORK_CODES.has(code) || SERVER_GONE.test(code))) return true;
	if (typeof message === 'string' && DRIVER_MESSAGES.some((text) => message.includes(text)))
		return true;
	// Node reports a refused connection to several addresses as an AggregateError.
	if (Array.isArray(errors) && errors.some((inner) => isDatabaseUnavailable(inner, depth + 1)))
		return true;
	// Auth.js wraps what its callbacks threw as `cause: { err }`.
	return isDatabaseUnavailable(cause, depth + 1) || isDatabaseUnavailable(err, depth + 1);
}

/** Whether the database answers `SELECT 1` within `timeoutMs` (a connection that hangs counts as no). */
export async function databaseAnswers(timeoutMs: number): Promise<boolean> {
	let timer: ReturnType<typeof setTimeout> | undefined;
	const gaveUp = new Promise<false>((resolve) => (timer = setTimeout(resolve, timeoutMs, false)));
	const answered = sql`SELECT 1`.execute(db).then(
		() => true,
		() => false
	);
	try {
		return await Promise.race([answered, gaveUp]);
	} finally {
		clearTimeout(timer);
	}
}
