/**
 * Resumable uploads answered by the Node.js server itself (server.js at the project root), ahead
 * of SvelteKit: a PATCH body goes from the socket to @tus/server's PATCH handler and the disk as
 * the Node.js stream it is, without SvelteKit's (or srvx's) copy into a Web stream and its
 * answer's copy back. Everything else about the request is as through
 * hooks.server.ts: the caller is looked up the same way (an API token, else the session cookie and
 * the channel cookie), `answerUpload` makes the same role, channel and body checks, the answer
 * gets the same security headers, and a database outage the same 503.
 *
 * The app's modules live inside the build, so server.js cannot import this file: importing the
 * build's handler runs hooks.server.ts, which calls `offerNodeRoutes()`, and server.js picks the
 * routes up from `globalThis[NODE_ROUTES]`. Under `vite dev` there is no server.js and the hook
 * answers uploads itself.
 */
import type { IncomingMessage, ServerResponse } from 'node:http';
import { NodeRequest, sendNodeResponse } from 'srvx/node';
import { json } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { UPLOAD_PATH } from '$lib/upload-rules';
import {
	CHANNEL_COOKIE,
	identityFromSession,
	identityFromToken,
	type Identity
} from '../auth/identity';
import { sessionIdFromCookie } from '../auth/session-cookie';
import { isDatabaseUnavailable } from '../db/outage';
import { databaseDownJson } from '../http/outage';
import { withSecurityHeaders } from '../http/security-headers';
import { answerUpload, tusError } from './tus-server';
import { bodySizeLimit } from './patch-body';

/** Where server.js finds the routes it answers before SvelteKit. */
export const NODE_ROUTES = Symbol.for('wrenchroll.node-routes');

export interface NodeRoutes {
	/** True when the request is one the Node.js server answers itself. */
	claims(req: IncomingMessage): boolean;
	/** Answers such a request in full. Never rejects. */
	answer(req: IncomingMessage, res: ServerResponse): Promise<void>;
}

/** The path as SvelteKit's `event.url.pathname` reads it (dot segments resolved). */
function pathnameOf(req: IncomingMessage): string {
	try {
		return new URL(req.url ?? '/', 'http://wrenchroll.invalid').pathname;
	} catch {
		return '';
	}
}

const isUploadPath = (pathname: string) =>
	pathname === UPLOAD_PATH || pathname.startsWith(UPLOAD_PATH + '/');

/** Whether the public address is https, as adapter-node decides it (ORIGIN, else PROTOCOL_HEADER, else https). */
function servedOverHttps(req: IncomingMessage): boolean {
	if (env.ORIGIN) return env.ORIGIN.startsWith('https:');
	const header = env.PROTOCOL_HEADER?.toLowerCase();
	const value = header ? req.headers[header] : undefined;
	return (typeof value === 'string' ? value : 'https') === 'https';
}

/** A cookie's value from the Cookie header, decoded as SvelteKit's `cookies.get` does. */
function cookieValue(header: string | null, name: string): string | undefined {
	for (const pair of (header ?? '').split(/;\s*/)) {
		if (!pair.startsWith(name + '=')) continue;
		const value = pair.slice(name.length + 1);
		try {
			return decodeURIComponent(value);
		} catch {
			return value;
		}
	}
	return undefined;
}

const nobody: Pick<Identity, 'person' | 'channel' | 'roles'> = {
	person: null,
	channel: null,
	roles: []
};

async function uploadAnswer(req: IncomingMessage, request: Request): Promise<Response> {
	const pathname = pathnameOf(req);
	if (request.method === 'OPTIONS') return answerUpload(request, pathname, nobody);
	const authorization = request.headers.get('authorization');
	if (authorization?.startsWith('Bearer ')) {
		const identity = await identityFromToken(authorization.slice(7).trim());
		if (!identity.person)
			return json(
				{ error: 'That API token is unknown or revoked. Create a new one under Account.' },
				{ status: 401 }
			);
		return answerUpload(request, pathname, identity);
	}
	const sessionId = await sessionIdFromCookie(request, env.AUTH_SECRET, servedOverHttps(req));
	const identity = sessionId
		? await identityFromSession(
				sessionId,
				cookieValue(request.headers.get('cookie'), CHANNEL_COOKIE)
			)
		: nobody;
	return answerUpload(request, pathname, identity);
}

async function answer(req: IncomingMessage, res: ServerResponse): Promise<void> {
	// adapter-node's request body limit, which SvelteKit applied to every upload request before: a
	// PATCH is judged by checkPatchBody (answerUpload); any other body (a creation POST carrying
	// its first bytes) here, by its Content-Length or, without one, as it streams.
	const limit = bodySizeLimit(env.BODY_SIZE_LIMIT);
	const judgedHere = req.method !== 'PATCH';
	const request = new NodeRequest({
		req,
		res,
		maxRequestBodySize: judgedHere ? limit : undefined
	}) as unknown as Request;
	// A PATCH of known length hands tus the Node.js request itself as its body, not a Web stream
	// over it (upload-store.ts); a chunked one is spooled through the Web stream (patch-body.ts).
	if (!judgedHere && req.headers['content-length'] !== undefined)
		Object.defineProperty(request, 'body', { value: req });
	let response: Response;
	try {
		response =
			judgedHere && Number(req.headers['content-length'] ?? 0) > limit
				? tusError(
						413,
						`That request is larger than the server takes in one request (${limit} bytes). Send the file in smaller chunks.`
					)
				: await uploadAnswer(req, request);
	} catch (failure) {
		if (isDatabaseUnavailable(failure)) {
			console.error(
				'database unavailable:',
				failure instanceof Error ? failure.message || failure.name : failure
			);
			response = databaseDownJson();
		} else {
			console.error(failure);
			response = json({ error: 'Something went wrong on the server.' }, { status: 500 });
		}
	}
	try {
		await sendNodeResponse(res, withSecurityHeaders(response, true));
	} catch (failure) {
		// The client went away while the answer was being written: nothing left to tell it.
		if (!res.destroyed) res.destroy(failure as Error);
	}
}

/** Offers the Node-level routes to server.js (called once from hooks.server.ts). */
export function offerNodeRoutes(): void {
	const routes: NodeRoutes = { claims: (req) => isUploadPath(pathnameOf(req)), answer };
	(globalThis as Record<symbol, unknown>)[NODE_ROUTES] = routes;
}
