/**
 * The server half of keyset paging ($lib/schemas/paging.ts has the cursor and the query fields).
 * A list names its order as sort keys, each a non-null SQL expression with a direction and a kind,
 * the last one the row's id. `keysetSelections` adds the keys to the select list as text (exactly
 * as PostgreSQL prints them, so a timestamp keeps its microseconds), `keysetAfter` is the WHERE
 * that starts after the cursor (`k1 > v1 OR (k1 = v1 AND k2 > v2) OR …`, each comparison in its
 * key's own direction), `keysetOrderBy` the ORDER BY, and `keysetPage` reads one row more than
 * the limit to know whether a next page exists.
 *
 * Every cursor value is checked against its key's kind before it reaches SQL, so a damaged cursor
 * is a 400 on `after` and never a cast error in the database.
 */
import { sql, type RawBuilder } from 'kysely';
import { DomainError } from './api';
import { isUuid } from '../auth/identity';
import { dateProblem } from '$lib/schemas/fields';
import { CURSOR_MESSAGE, encodeCursor, type Cursor, type Page } from '$lib/schemas/paging';

export type KeyKind = 'text' | 'date' | 'uuid' | 'integer' | 'float' | 'timestamp';

export interface SortKey {
	/** A non-null expression (wrap nullable columns in coalesce). */
	expression: RawBuilder<unknown>;
	direction: 'asc' | 'desc';
	kind: KeyKind;
}

const castTo: Record<KeyKind, string> = {
	text: 'text',
	date: 'date',
	uuid: 'uuid',
	integer: 'bigint',
	float: 'double precision',
	timestamp: 'timestamptz'
};

const TIMESTAMP =
	/^(\d{4}-\d{2}-\d{2}) (\d{2}):(\d{2}):(\d{2})(\.\d{1,6})?[+-](\d{2})(?::(\d{2})){0,2}$/;

/** Whether a cursor value can be what a key of this kind printed. */
export function keyValueFits(kind: KeyKind, value: unknown): value is string {
	if (typeof value !== 'string' || value.length > 2000) return false;
	switch (kind) {
		case 'text':
			// PostgreSQL text cannot hold NUL.
			return !value.includes('\u0000');
		case 'uuid':
			return isUuid(value);
		case 'integer':
			return /^-?\d{1,18}$/.test(value);
		case 'float': {
			// double precision as PostgreSQL prints it (shortest exact form, so it reads back equal).
			if (value === 'Infinity' || value === '-Infinity') return true;
			const match = /^-?(\d{1,400})(?:\.(\d{1,400}))?(?:e[+-]\d{1,4})?$/.exec(value);
			if (!match) return false;
			// PostgreSQL refuses what overflows or underflows to zero ("out of range").
			const number = Number(value);
			return (
				Number.isFinite(number) && (number !== 0 || !/[1-9]/.test(match[1] + (match[2] ?? '')))
			);
		}
		case 'date':
			return value === 'infinity' || value === '-infinity' || dateProblem(value) === null;
		case 'timestamp': {
			const match = TIMESTAMP.exec(value);
			return (
				match !== null &&
				dateProblem(match[1]) === null &&
				Number(match[2]) < 24 &&
				Number(match[3]) < 60 &&
				Number(match[4]) < 60 &&
				Number(match[6]) <= 15
			);
		}
	}
}

const badCursor = () => new DomainError(400, CURSOR_MESSAGE, { after: [CURSOR_MESSAGE] });

/** The sort keys as text columns `pageKey0…`, for the cursor of the page's last row. */
export function keysetSelections(keys: readonly SortKey[]) {
	return keys.map((key, index) => sql<string>`(${key.expression})::text`.as(`pageKey${index}`));
}

/** ORDER BY the keys, each in its direction. */
export function keysetOrderBy(keys: readonly SortKey[]): RawBuilder<unknown> {
	return sql.join(keys.map((key) => sql`${key.expression} ${sql.raw(key.direction)}`));
}

/**
 * The rows strictly after the cursor in this order; `true` without a cursor. A cursor made for
 * another order or holding values of the wrong kind is a 400 on `after`.
 */
export function keysetAfter(
	order: string,
	keys: readonly SortKey[],
	cursor: Cursor | undefined
): RawBuilder<boolean> {
	if (!cursor) return sql<boolean>`true`;
	if (cursor.order !== order || cursor.keys.length !== keys.length) throw badCursor();
	const values = keys.map((key, index) => {
		const value = cursor.keys[index];
		if (!keyValueFits(key.kind, value)) throw badCursor();
		return sql`${value}::${sql.raw(castTo[key.kind])}`;
	});
	const alternatives = keys.map((key, index) => {
		const equalBefore = keys
			.slice(0, index)
			.map((earlier, at) => sql`${earlier.expression} = ${values[at]}`);
		const beyond = sql`${key.expression} ${sql.raw(key.direction === 'asc' ? '>' : '<')} ${values[index]}`;
		return sql`(${sql.join([...equalBefore, beyond], sql` AND `)})`;
	});
	// The first key's bound on its own as well (implied by the alternatives), so an index on the
	// keys starts reading at the cursor instead of filtering every row before it.
	const first = keys[0];
	const bound = sql`${first.expression} ${sql.raw(first.direction === 'asc' ? '>=' : '<=')} ${values[0]}`;
	return sql<boolean>`(${bound} AND (${sql.join(alternatives, sql` OR `)}))`;
}

/**
 * One page from rows read with `limit + 1`: the rows without their key columns and the cursor of
 * the last one when another row followed.
 */
export function keysetPage<Row extends Record<string, unknown>>(
	order: string,
	keys: readonly SortKey[],
	rows: readonly Row[],
	limit: number
): Page<Omit<Row, `pageKey${number}`>> {
	const shown = rows.slice(0, limit);
	const last = shown.at(-1);
	const next =
		rows.length > limit && last
			? encodeCursor(
					order,
					keys.map((_, index) => String(last[`pageKey${index}`]))
				)
			: null;
	const items = shown.map((row) => {
		const copy: Record<string, unknown> = { ...row };
		for (let index = 0; index < keys.length; index++) delete copy[`pageKey${index}`];
		return copy as Omit<Row, `pageKey${number}`>;
	});
	return { items, next };
}
