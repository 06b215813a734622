/**
 * A fake SMTP server on loopback (the smtp-server package) for the demo and the tests: it accepts
 * every message and stores it as JSON in a folder that the dev mailbox page reads.
 */
import { SMTPServer } from 'smtp-server';
import PostalMime from 'postal-mime';
import { mkdirSync, renameSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { randomUUID } from 'node:crypto';

export interface FakeMail {
	url: string;
	close(): Promise<void>;
}

export async function startFakeMail(options: { port: number; dir: string }): Promise<FakeMail> {
	mkdirSync(options.dir, { recursive: true });
	const server = new SMTPServer({
		authOptional: true,
		// smtp-server's bundled self-signed certificate has expired: offer no STARTTLS on loopback.
		disabledCommands: ['STARTTLS'],
		logger: false,
		onData(stream, session, callback) {
			const chunks: Buffer[] = [];
			stream.on('data', (chunk: Buffer) => chunks.push(chunk));
			stream.on('end', async () => {
				try {
					const parsed = await PostalMime.parse(Buffer.concat(chunks));
					const receivedAt = new Date().toISOString();
					const id = randomUUID();
					const record = {
						id,
						receivedAt,
						from:
							parsed.from?.address ??
							String(session.envelope.mailFrom && session.envelope.mailFrom.address),
						to: session.envelope.rcptTo.map((r) => r.address),
						subject: parsed.subject ?? '',
						text: parsed.text ?? ''
					};
					// Write then rename, so a reader never sees half a message.
					const name = path.join(options.dir, `${receivedAt.replace(/[:.]/g, '-')}-${id}.json`);
					writeFileSync(name + '.part', JSON.stringify(record, null, 2));
					renameSync(name + '.part', name);
					callback();
				} catch (failure) {
					callback(failure as Error);
				}
			});
		}
	});
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(options.port, '127.0.0.1', () => resolve());
	});
	return {
		url: `smtp://127.0.0.1:${options.port}`,
		close: () => new Promise((resolve) => server.close(() => resolve()))
	};
}
