/**
 * Wraps a +server.ts handler so every failure answers JSON `{ error, issues? }` with the right status:
 * 400 with zod's field issues, 401, 403, 404, 409 from the guard and domain modules, and 503 with
 * Retry-After when the database is out of reach.
 */
import { isHttpError, isRedirect, json, type RequestEvent } from '@sveltejs/kit';
import { z } from 'zod';
import { isDatabaseUnavailable } from '../db/outage';
import { databaseDownJson } from './outage';

export class DomainError extends Error {
	constructor(
		public status: 400 | 404 | 409 | 413 | 422 | 429,
		message: string,
		public issues?: Record<string, string[]>,
		public extra?: Record<string, unknown>
	) {
		super(message);
	}
}

/** The one "not found" a domain function throws: a record of another channel is not found either. */
export const notFound = (what = 'That record', hint?: string) =>
	new DomainError(404, `${what} was not found in this channel.${hint ? ` ${hint}` : ''}`);

/** zod issues as { field: [messages] }, field names dotted. */
export function fieldIssues(zodError: z.ZodError): Record<string, string[]> {
	const issues: Record<string, string[]> = {};
	for (const issue of zodError.issues) {
		const key = issue.path.length ? issue.path.join('.') : 'form';
		(issues[key] ??= []).push(issue.message);
	}
	return issues;
}

/** JSON bodies above this are refused (uploads use tus, not JSON). */
const MAX_JSON_BYTES = 4 * 1024 * 1024;

const tooLarge = () =>
	new DomainError(
		413,
		`That request is too large: at most ${MAX_JSON_BYTES / 1024 / 1024} MB of JSON.`
	);

/**
 * The body's bytes, counted as they arrive: a declared Content-Length over `limit` is refused
 * unread, and a chunked body (no length) is refused as soon as it passes the limit, so no more
 * than `limit` bytes of one request are ever held in memory. The rest of a refused body is read
 * and dropped in the background, so the client can still read the answer on a healthy connection.
 */
async function readLimited(request: Request, limit: number): Promise<Uint8Array> {
	const discardRest = () => void request.body?.pipeTo(new WritableStream()).catch(() => {});
	if (Number(request.headers.get('content-length') ?? 0) > limit) {
		discardRest();
		throw tooLarge();
	}
	if (!request.body) return new Uint8Array();
	const reader = request.body.getReader();
	const pieces: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.byteLength;
		if (size > limit) {
			void (async () => {
				while (!(await reader.read()).done);
			})().catch(() => {});
			throw tooLarge();
		}
		pieces.push(value);
	}
	return Buffer.concat(pieces, size);
}

/** Reads a JSON body of at most 4 MiB and validates it; malformed JSON is a 400 in plain words. */
export async function readJson<T extends z.ZodType>(
	event: RequestEvent,
	schema: T
): Promise<z.infer<T>> {
	let bytes: Uint8Array;
	try {
		bytes = await readLimited(event.request, MAX_JSON_BYTES);
	} catch (failure) {
		if (failure instanceof DomainError) throw failure;
		throw new DomainError(400, 'The request body did not arrive whole. Send it again.');
	}
	let body: unknown;
	try {
		body = JSON.parse(new TextDecoder().decode(bytes));
	} catch {
		throw new DomainError(400, 'The request body is not valid JSON.');
	}
	const parsed = schema.safeParse(body);
	if (!parsed.success)
		throw new DomainError(400, 'Some fields need fixing.', fieldIssues(parsed.error));
	return parsed.data;
}

export function parseWith<T extends z.ZodType>(schema: T, value: unknown): z.infer<T> {
	const parsed = schema.safeParse(value);
	if (!parsed.success)
		throw new DomainError(400, 'Some fields need fixing.', fieldIssues(parsed.error));
	return parsed.data;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any
export function api<Event extends RequestEvent<any, any>>(
	handler: (event: Event) => Response | Promise<Response>
): (event: Event) => Promise<Response> {
	return async (event) => {
		try {
			return await handler(event);
		} catch (failure) {
			if (isRedirect(failure)) throw failure;
			if (failure instanceof DomainError) {
				return json(
					{
						error: failure.message,
						...(failure.issues ? { issues: failure.issues } : {}),
						...failure.extra
					},
					{ status: failure.status }
				);
			}
			if (isHttpError(failure))
				return json({ error: failure.body.message }, { status: failure.status });
			if (isDatabaseUnavailable(failure)) {
				console.error('database unavailable:', (failure as Error).message);
				return databaseDownJson();
			}
			if (failure instanceof z.ZodError)
				return json(
					{ error: 'Some fields need fixing.', issues: fieldIssues(failure) },
					{ status: 400 }
				);
			console.error(failure);
			return json(
				{
					error:
						'Something went wrong on the server. Try again; if it keeps happening, tell your producer.'
				},
				{ status: 500 }
			);
		}
	};
}
