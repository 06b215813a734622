/**
 * Wrenchroll's production server: a small node:http server around adapter-node's `handler` (the
 * adapter's "Custom server" pattern). `npm start`, the tests and the benches run it; run it as
 * `node server.js [build folder]` after `npm run build`. Two things happen here, before SvelteKit:
 *
 * 1. Resumable uploads (`/api/uploads`, tus) are answered by the app's Node-level route
 *    (src/lib/server/footage/node-uploads.ts): a PATCH body streams from the socket to
 *    @tus/server and the disk without SvelteKit's copy into a Web stream and its answer's copy
 *    back. The route makes the same sign-in, role, channel and body checks as the SvelteKit hook,
 *    and sets the same headers. Everything else goes to SvelteKit.
 * 2. HTML and JSON answers are compressed (brotli or gzip, whichever the client's Accept-Encoding
 *    prefers; RFC 9110 §8.4 and §12.5.3) with the `compression` package. Never compressed: tus
 *    answers (above), answers to a Range request or carrying Content-Range (footage downloads),
 *    HEAD answers, bodies under 1 KB, a client that sends no Accept-Encoding, and every other
 *    type (event streams, files, CSV).
 *
 * Settings: HOST (default 0.0.0.0), PORT (3000), KEEP_ALIVE_TIMEOUT and HEADERS_TIMEOUT (seconds),
 * SHUTDOWN_TIMEOUT (30 s), the build folder (the argument, else WRENCHROLL_BUILD_DIR, else build/),
 * and everything adapter-node's handler reads (ORIGIN, BODY_SIZE_LIMIT, ADDRESS_HEADER, …).
 */
import http from 'node:http';
import path from 'node:path';
import process from 'node:process';
import { pathToFileURL } from 'node:url';
import compression from 'compression';

const buildDir = path.resolve(
	import.meta.dirname,
	process.argv[2] ?? process.env.WRENCHROLL_BUILD_DIR ?? 'build'
);
// Importing the handler starts the app (its init hook runs), which offers its Node-level routes.
const { handler } = await import(pathToFileURL(path.join(buildDir, 'handler.js')).href);
const routes = globalThis[Symbol.for('wrenchroll.node-routes')];
if (!routes) throw new Error(`The build in ${buildDir} offers no upload route: rebuild it.`);

const compressible = new Set(['text/html', 'application/json']);
const compress = compression({
	filter(req, res) {
		if (req.headers.range || res.getHeader('content-range')) return false;
		const type = String(res.getHeader('content-type') ?? '')
			.split(';')[0]
			.trim()
			.toLowerCase();
		return compressible.has(type);
	}
});

const seconds = (name) => {
	const value = process.env[name];
	return value === undefined || value === '' ? undefined : Number(value) * 1000;
};

const notFound = (res) => () => {
	res.statusCode = 404;
	res.end('Not found');
};

const server = http.createServer((req, res) => {
	if (routes.claims(req)) return void routes.answer(req, res);
	// A client that accepts no encoding (scripts, the benches) gets no compression layer at all.
	if (!req.headers['accept-encoding']) return void handler(req, res, notFound(res));
	compress(req, res, () => {
		// Send each piece as it is written (a page streamed in parts stays streamed).
		const write = res.write;
		res.write = function (...args) {
			const accepted = write.apply(this, args);
			res.flush?.();
			return accepted;
		};
		handler(req, res, notFound(res));
	});
});
const keepAlive = seconds('KEEP_ALIVE_TIMEOUT');
if (keepAlive !== undefined) server.keepAliveTimeout = keepAlive;
const headersTimeout = seconds('HEADERS_TIMEOUT');
if (headersTimeout !== undefined) server.headersTimeout = headersTimeout;

const host = process.env.HOST || '0.0.0.0';
const port = Number(process.env.PORT || 3000);
server.listen(port, host, () => console.log(`Listening on http://${host}:${port}`));

// As adapter-node's own server: stop taking requests, let running ones finish (at most
// SHUTDOWN_TIMEOUT seconds), then tell the app (its hook stops the mail sender and the pool).
let stopping = false;
function shutdown(reason) {
	if (stopping) return;
	stopping = true;
	server.closeIdleConnections();
	server.close(() => process.emit('sveltekit:shutdown', reason));
	setTimeout(() => server.closeAllConnections(), seconds('SHUTDOWN_TIMEOUT') ?? 30_000).unref();
}
server.on('request', (req) => req.on('close', () => stopping && server.closeIdleConnections()));
process.on('SIGTERM', () => shutdown('SIGTERM'));
process.on('SIGINT', () => shutdown('SIGINT'));
