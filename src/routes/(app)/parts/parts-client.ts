/** The parts pages' calls to /api/parts…: JSON in, an answer or the server's words out. */
import type { PartPage } from '$lib/server/merch/parts';

export type { PartPage };

export { call, type Answer } from '$lib/api-call';

/** `?q=…&sort=…` for a search, leaving out the defaults so links stay short. */
export function searchParams(query: {
	q?: string;
	category?: string;
	status?: string;
	sort?: string;
	dir?: string;
	page?: number;
	pageSize?: number;
	after?: string | null;
}): URLSearchParams {
	const params = new URLSearchParams();
	if (query.q) params.set('q', query.q);
	if (query.category) params.set('category', query.category);
	if (query.status) params.set('status', query.status);
	if (query.sort && query.sort !== 'sku') params.set('sort', query.sort);
	if (query.dir && query.dir !== 'asc') params.set('dir', query.dir);
	if (query.page && query.page > 1) params.set('page', String(query.page));
	if (query.pageSize && query.pageSize !== 25) params.set('pageSize', String(query.pageSize));
	if (query.after) params.set('after', query.after);
	return params;
}

/** 119.00 USD → "$119.00" for USD, "119.00 EUR" otherwise. */
export function formatPrice(cents: number, currency: string): string {
	const amount = `${Math.floor(cents / 100).toLocaleString('en')}.${String(cents % 100).padStart(2, '0')}`;
	return currency === 'USD' ? `$${amount}` : `${amount} ${currency}`;
}
