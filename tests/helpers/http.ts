/** Talking to the built server over HTTP as a person would: sign-in, cookies, JSON calls, the fake mailbox. */
import { request as httpRequest } from 'node:http';
import { inject } from 'vitest';
import pg from 'pg';
import { parse as parseDevalue } from 'devalue';

export const DEMO_PASSWORD = 'wrenchroll-demo-bay3';
export const demo = {
	producer: 'dana@torquehaven.test',
	host: 'rico@torquehaven.test',
	camera: 'mika@torquehaven.test',
	editor: 'jules@cutbench.test',
	merch: 'priya@torquehaven.test',
	otherProducer: 'sam@dunewagon.test'
} as const;

export const baseUrl = () => inject('baseUrl');

/**
 * One HTTP request from a chosen loopback source address (all of 127.0.0.0/8 reaches the server
 * on Linux), so a test can act as a client of its own: the server's per-client limits see
 * `from`, not the 127.0.0.1 every other test shares. Global fetch cannot pick its source address.
 */
export function requestFrom(
	from: string,
	url: string,
	init: { method?: string; headers?: Headers; body?: string } = {}
): Promise<Response> {
	return new Promise((resolve, reject) => {
		const headers: Record<string, string> = {};
		init.headers?.forEach((value, name) => (headers[name] = value));
		const outgoing = httpRequest(
			url,
			{ method: init.method ?? 'GET', headers, localAddress: from },
			(incoming) => {
				const chunks: Buffer[] = [];
				incoming.on('data', (chunk: Buffer) => chunks.push(chunk));
				incoming.on('error', reject);
				incoming.on('end', () => {
					const answer = new Headers();
					for (const [name, value] of Object.entries(incoming.headers))
						for (const one of [value ?? []].flat()) answer.append(name, one);
					const status = incoming.statusCode ?? 500;
					const empty = status === 204 || status === 304 || init.method === 'HEAD';
					resolve(new Response(empty ? null : Buffer.concat(chunks), { status, headers: answer }));
				});
			}
		);
		outgoing.on('error', reject);
		outgoing.end(init.body);
	});
}

/** A person's browser, minus the browser: keeps cookies between requests. */
export class Visitor {
	cookies = new Map<string, string>();

	/**
	 * `from`: a loopback source address of this visitor's own (see requestFrom); `base`: another
	 * server's origin (a second server a test starts), else the shared test server.
	 */
	constructor(
		readonly from?: string,
		readonly base?: string
	) {}

	private origin(): string {
		return this.base ?? baseUrl();
	}

	cookieHeader(): string {
		return [...this.cookies].map(([name, value]) => `${name}=${value}`).join('; ');
	}

	async request(
		path: string,
		init: RequestInit & { json?: unknown; form?: Record<string, string | string[]> } = {}
	): Promise<Response> {
		const headers = new Headers(init.headers);
		headers.set('origin', this.origin());
		if (this.cookies.size) headers.set('cookie', this.cookieHeader());
		let body = init.body;
		if (init.json !== undefined) {
			headers.set('content-type', 'application/json');
			body = JSON.stringify(init.json);
		}
		if (init.form) {
			const params = new URLSearchParams();
			for (const [key, value] of Object.entries(init.form))
				for (const v of [value].flat()) params.append(key, v);
			body = params;
			headers.set('content-type', 'application/x-www-form-urlencoded;charset=UTF-8');
			if (!headers.has('accept')) headers.set('accept', 'text/html');
		}
		const response = this.from
			? await requestFrom(this.from, this.origin() + path, {
					method: init.method,
					headers,
					body: body === undefined || body === null ? undefined : String(body)
				})
			: await fetch(this.origin() + path, { ...init, headers, body, redirect: 'manual' });
		for (const line of response.headers.getSetCookie()) {
			const [pair, ...attributes] = line.split(';');
			const [name, ...rest] = pair.split('=');
			const value = rest.join('=');
			const expired = attributes.some(
				(a) => /max-age=0/i.test(a) || /expires=Thu, 01 Jan 1970/i.test(a)
			);
			if (expired || value === '') this.cookies.delete(name.trim());
			else this.cookies.set(name.trim(), value);
		}
		return response;
	}

	/** Posts a SvelteKit form action the way `use:enhance` does, and decodes its answer. */
	async action(
		path: string,
		form: Record<string, string | string[]>
	): Promise<{ type: string; status: number; data?: any; location?: string }> {
		const response = await this.request(path, {
			method: 'POST',
			form,
			headers: { accept: 'application/json', 'x-sveltekit-action': 'true' }
		});
		const result = await response.json();
		if (result.data) result.data = parseDevalue(result.data);
		if (result.type === 'error') result.status = response.status;
		return result;
	}

	async signIn(email: string, password = DEMO_PASSWORD): Promise<Response> {
		return this.request('/signin', { method: 'POST', form: { email, password } });
	}

	async api(path: string, init: RequestInit & { json?: unknown } = {}) {
		const response = await this.request(path, init);
		const text = await response.text();
		let body: any = text;
		try {
			body = text ? JSON.parse(text) : null;
		} catch {
			// not JSON: keep the text
		}
		return { status: response.status, body, headers: response.headers };
	}
}

export async function signedIn(email: string, from?: string): Promise<Visitor> {
	const visitor = new Visitor(from);
	const response = await visitor.signIn(email);
	if (response.status !== 303) throw new Error(`sign-in as ${email} answered ${response.status}`);
	return visitor;
}

/**
 * The first mail to `address` received at or after `after` (and whose subject contains `subject`,
 * when given: other test files running at the same time may mail the same demo person).
 */
export async function mailTo(
	address: string,
	{ after = 0, timeoutMs = 15_000, subject = '' } = {}
) {
	const deadline = Date.now() + timeoutMs;
	while (Date.now() < deadline) {
		const response = await fetch(`${baseUrl()}/dev/mail/messages.json`);
		const { messages } = (await response.json()) as {
			messages: { to: string[]; subject: string; text: string; receivedAt: string }[];
		};
		const found = messages.find(
			(m) =>
				m.to.includes(address) && Date.parse(m.receivedAt) >= after && m.subject.includes(subject)
		);
		if (found) return found;
		await new Promise((resolve) => setTimeout(resolve, 200));
	}
	throw new Error(`no mail to ${address} arrived within ${timeoutMs} ms`);
}

let pool: pg.Pool | null = null;
/** Direct database reads, to check what a request did or did not change. */
export async function sql<T = any>(text: string, params: unknown[] = []): Promise<T[]> {
	pool ??= new pg.Pool({ connectionString: inject('databaseUrl'), max: 2 });
	return (await pool.query(text, params)).rows as T[];
}

export function linkIn(text: string): string {
	const match = text.match(/https?:\/\/\S+/);
	if (!match) throw new Error(`no link in: ${text}`);
	return match[0];
}

/**
 * A channel of a test file's own with one crew member (signing in with the same password as the
 * demo account `passwordOf`) and one episode, so the demo channel's lists stay as seeded. Answers
 * the new ids; the file removes its rows afterwards.
 */
export async function ownChannel(setup: {
	channelName: string;
	email: string;
	personName: string;
	role: string;
	passwordOf: string;
	episode: { title: string; slug: string; stage?: string };
}): Promise<{ channelId: string; personId: string; episodeId: string }> {
	const [{ id: channelId }] = await sql<{ id: string }>(
		`INSERT INTO channel (name, frame_rate) VALUES ($1, '29.97') RETURNING id`,
		[setup.channelName]
	);
	const [{ id: personId }] = await sql<{ id: string }>(
		`INSERT INTO person (email, name, password_hash)
		 SELECT $1, $2, password_hash FROM person WHERE email = $3 RETURNING id`,
		[setup.email, setup.personName, setup.passwordOf]
	);
	await sql(`INSERT INTO membership (channel_id, person_id, roles) VALUES ($1, $2, ARRAY[$3])`, [
		channelId,
		personId,
		setup.role
	]);
	const [{ id: episodeId }] = await sql<{ id: string }>(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage)
		 VALUES ($1, $2, $3, 600, '29.97', coalesce($4, 'script')) RETURNING id`,
		[channelId, setup.episode.title, setup.episode.slug, setup.episode.stage ?? null]
	);
	return { channelId, personId, episodeId };
}
