/**
 * Keyset paging, shared by every list: a page asks for the rows after the last one it showed
 * (`?after=<cursor>&limit=`) instead of skipping rows with OFFSET, so the database starts reading
 * at the cursor through an index and the cost of a page does not grow with the channel.
 *
 * A cursor is opaque to callers: base64url of JSON `{ o, k }`, where `o` names the list's order
 * (for example `publish:asc`) and `k` holds the sort-key values of the last row shown, ending with
 * its id (so rows with equal sort keys still come in one stable order). A cursor made for another
 * order, or one that was changed by hand, is a 400 on the `after` field, never a database error.
 */
import { z } from 'zod';
import { wholeNumber } from './fields';

/** Rows a page shows unless the caller asks for fewer or more. */
export const DEFAULT_PAGE_SIZE = 50;
/** The most rows one page answers. */
export const MAX_PAGE_SIZE = 200;
/** No cursor we make is longer; anything longer is refused before it is decoded. */
const MAX_CURSOR_LENGTH = 1000;

export type CursorKey = string | number | null;
export interface Cursor {
	order: string;
	keys: CursorKey[];
}

export const CURSOR_MESSAGE =
	'This “more” link is out of date or damaged. Go back to the first page and try again.';

/** base64url of the order and the keys of the last row shown. */
export function encodeCursor(order: string, keys: readonly CursorKey[]): string {
	const bytes = new TextEncoder().encode(JSON.stringify({ o: order, k: keys }));
	let binary = '';
	for (const byte of bytes) binary += String.fromCharCode(byte);
	return btoa(binary).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

/** The cursor's order and keys, or null when it is not one of ours. */
export function decodeCursor(text: string): Cursor | null {
	if (text.length === 0 || text.length > MAX_CURSOR_LENGTH || !/^[A-Za-z0-9_-]+$/.test(text))
		return null;
	try {
		const binary = atob(text.replace(/-/g, '+').replace(/_/g, '/'));
		const bytes = Uint8Array.from(binary, (character) => character.charCodeAt(0));
		const value: unknown = JSON.parse(new TextDecoder('utf-8', { fatal: true }).decode(bytes));
		if (typeof value !== 'object' || value === null) return null;
		const { o, k } = value as { o?: unknown; k?: unknown };
		if (typeof o !== 'string' || !Array.isArray(k) || k.length === 0 || k.length > 8) return null;
		const keys: CursorKey[] = [];
		for (const key of k) {
			if (key === null || typeof key === 'string') keys.push(key);
			else if (typeof key === 'number' && Number.isFinite(key)) keys.push(key);
			else return null;
		}
		return { order: o, keys };
	} catch {
		return null;
	}
}

/** `?after=&limit=` of every paged list; `after` decoded (a damaged one is a field message). */
export const pageQueryFields = {
	after: z
		.string()
		.optional()
		.transform((text, context) => {
			if (text === undefined || text === '') return undefined;
			const cursor = decodeCursor(text);
			if (!cursor) {
				context.addIssue({ code: 'custom', message: CURSOR_MESSAGE });
				return z.NEVER;
			}
			return cursor;
		}),
	limit: wholeNumber({
		coerce: true,
		error: 'Ask for a number of rows, such as 50.',
		min: 1,
		max: MAX_PAGE_SIZE,
		tooSmall: 'Ask for at least 1 row.',
		tooBig: `Ask for at most ${MAX_PAGE_SIZE} rows at a time.`
	}).default(DEFAULT_PAGE_SIZE)
};

export const pageQuerySchema = z.object(pageQueryFields);
export type PageQuery = z.infer<typeof pageQuerySchema>;

/** One page of a list: its rows and the cursor of the next page (null on the last one). */
export interface Page<Row> {
	items: Row[];
	next: string | null;
}
