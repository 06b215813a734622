/** Loopback helpers for tests: a free port, and waiting for a server to answer. */
import { createServer } from 'node:net';

export function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const server = createServer();
		server.unref();
		server.on('error', reject);
		server.listen(0, '127.0.0.1', () => {
			const address = server.address();
			const port = typeof address === 'object' && address ? address.port : 0;
			server.close(() => resolve(port));
		});
	});
}

export async function waitForHttp(url: string, timeoutMs: number): Promise<void> {
	const deadline = Date.now() + timeoutMs;
	let lastError: unknown;
	while (Date.now() < deadline) {
		try {
			const response = await fetch(url);
			if (response.ok) return;
		} catch (failure) {
			lastError = failure;
		}
		await new Promise((resolve) => setTimeout(resolve, 150));
	}
	throw new Error(`${url} did not answer within ${timeoutMs} ms: ${String(lastError)}`);
}
