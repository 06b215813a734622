/** The parts pages' calls to /api/parts…: JSON in, an answer or the server's words out. */
import type { PartPage } from '$lib/server/merch/parts';

export type { PartPage };

export type Answer<T> =
	| { ok: true; data: T }
	| {
			ok: false;
			status: number;
			error: string;
			issues?: Record<string, string[]>;
			extra?: Record<string, unknown>;
	  };

/** A fetch that never throws: a dropped connection is an answer too. */
export async function call<T>(
	path: string,
	init: RequestInit & { json?: unknown } = {}
): Promise<Answer<T>> {
	const { json, ...rest } = init;
	let response: Response;
	try {
		response = await fetch(path, {
			...rest,
			headers: json === undefined ? rest.headers : { 'content-type': 'application/json' },
			body: json === undefined ? rest.body : JSON.stringify(json)
		});
	} catch (failure) {
		if (failure instanceof DOMException && failure.name === 'AbortError') throw failure;
		return {
			ok: false,
			status: 0,
			error: 'The server did not answer. Check the connection; nothing was changed.'
		};
	}
	const body = await response.json().catch(() => null);
	if (response.ok) return { ok: true, data: body as T };
	const { error, issues, ...extra } = (body ?? {}) as {
		error?: string;
		issues?: Record<string, string[]>;
	};
	return {
		ok: false,
		status: response.status,
		error: error ?? `The server answered ${response.status}; nothing was changed.`,
		issues,
		extra
	};
}

/** `?q=…&sort=…` for a search, leaving out the defaults so links stay short. */
export function searchParams(query: {
	q?: string;
	category?: string;
	status?: string;
	sort?: string;
	dir?: string;
	page?: number;
	pageSize?: number;
}): URLSearchParams {
	const params = new URLSearchParams();
	if (query.q) params.set('q', query.q);
	if (query.category) params.set('category', query.category);
	if (query.status) params.set('status', query.status);
	if (query.sort && query.sort !== 'sku') params.set('sort', query.sort);
	if (query.dir && query.dir !== 'asc') params.set('dir', query.dir);
	if (query.page && query.page > 1) params.set('page', String(query.page));
	if (query.pageSize && query.pageSize !== 25) params.set('pageSize', String(query.pageSize));
	return params;
}

/** 119.00 USD → "$119.00" for USD, "119.00 EUR" otherwise. */
export function formatPrice(cents: number, currency: string): string {
	const amount = `${Math.floor(cents / 100).toLocaleString('en')}.${String(cents % 100).padStart(2, '0')}`;
	return currency === 'USD' ? `$${amount}` : `${amount} ${currency}`;
}
