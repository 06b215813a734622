/**
 * The parts catalogue: search with server-side paging, sort and filters; create, change (with a
 * version check) and remove or retire; the part a typed SKU names. CSV import and export are in
 * parts-csv.ts, parts-import-preview.ts and parts-import.ts.
 *
 * Search matches every typed word, case-insensitively, anywhere in the part's SKU, name or brand:
 * each word is a LIKE on the stored lower-cased `search_text` column, which the trigram index of
 * the 2026-12-02-08 migration covers, so PostgreSQL answers from that index instead of reading
 * the whole catalogue (scripts/bench-parts.ts measures it at 20,000 parts).
 */
import { sql } from 'kysely';
import { db } from '../db';
import type { Database, PartTable } from '../db/types';
import type { Selectable, SelectQueryBuilder } from 'kysely';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import type { Executor } from '../episodes/episodes';
import type { PartCreate, PartSearch, PartSort, PartUpdate } from '$lib/schemas/parts';
import { textProblem } from '$lib/schemas/fields';
import {
	keysetAfter,
	keysetOrderBy,
	keysetPage,
	keysetSelections,
	type KeyKind,
	type SortKey
} from '../http/keyset';

export const partNotFound = () => notFound('That part');

/** The columns a catalogue row shows (and the import and export read). */
export const partColumns = [
	'part.id',
	'part.sku',
	'part.name',
	'part.category',
	'part.brand',
	'part.priceCents',
	'part.currency',
	'part.storeUrl',
	'part.fitmentNote',
	'part.status',
	'part.version'
] as const;

export type CatalogPart = Pick<
	Selectable<PartTable>,
	| 'id'
	| 'sku'
	| 'name'
	| 'category'
	| 'brand'
	| 'priceCents'
	| 'currency'
	| 'storeUrl'
	| 'fitmentNote'
	| 'status'
	| 'version'
>;

export interface PartPage {
	parts: CatalogPart[];
	/** How many parts match, counted up to PART_COUNT_CAP (then `totalCapped`: "250+"). */
	total: number;
	totalCapped: boolean;
	/** The cursor of the page after this one (`?after=`), null on the last page. */
	next: string | null;
	page: number;
	pageSize: number;
	pages: number;
	query: PartSearch;
}

/** Price in cents as the crew writes it: "119.00". */
export const priceText = (cents: number) =>
	`${Math.floor(cents / 100)}.${String(cents % 100).padStart(2, '0')}`;

/** `%`, `_` and `\` typed into a search are searched for, not used as LIKE wildcards. */
const escapeLike = (text: string) => text.replace(/[\\%_]/g, '\\$&');

/** lower(sku || ' ' || name || ' ' || brand), stored by the database and trigram-indexed. */
const searchText = sql<string>`part.search_text`;

const sortColumns: Record<
	PartSort,
	'part.sku' | 'part.name' | 'part.brand' | 'part.category' | 'part.priceCents' | 'part.status'
> = {
	sku: 'part.sku',
	name: 'part.name',
	brand: 'part.brand',
	category: 'part.category',
	price: 'part.priceCents',
	status: 'part.status'
};

const sortKinds: Record<PartSort, KeyKind> = {
	sku: 'text',
	name: 'text',
	brand: 'text',
	category: 'text',
	price: 'integer',
	status: 'text'
};

/**
 * A search counts matching parts up to this many and then says "250+": an exact count of a big
 * catalogue reads every match, and even a capped count reads rows until it has found this many (for
 * a word one part in twelve has, 3,000 rows for 250; 12,000 for 1,000, about 6 ms at 200,000
 * parts). Ten pages of 25 is more than anyone pages through: past that, the crew narrows the search.
 */
export const PART_COUNT_CAP = 250;

/** The words of a search, at most 8 of them (more add nothing but work). */
export function searchWords(q: string | undefined): string[] {
	return (q ?? '').split(/\s+/).filter(Boolean).slice(0, 8);
}

/** How many rows a search matches, counted up to PART_COUNT_CAP + 1. */
async function countUpToCap(
	executor: Executor,
	matching: SelectQueryBuilder<Database, 'part', object>
): Promise<number> {
	const { total } = await executor
		.selectFrom(
			matching
				.select(sql`1`.as('one'))
				.limit(PART_COUNT_CAP + 1)
				.as('capped')
		)
		.select((eb) => eb.fn.countAll<number>().as('total'))
		.executeTakeFirstOrThrow();
	return Number(total);
}

/**
 * One page of the catalogue (keyset-paged through `query.after`) and how many parts match, counted
 * up to PART_COUNT_CAP. A first page with no page after it is every match, so it is its own count;
 * otherwise the count is asked once the page is read (most searches are one page: a SKU, a brand
 * and a size), so a search that fits one page reads its matches once, not twice.
 */
export async function searchParts(
	channelId: string,
	query: PartSearch,
	executor: Executor = db
): Promise<PartPage> {
	let matching = executor.selectFrom('part').where('part.channelId', '=', channelId);
	// lower() in SQL, so the word is folded exactly as the stored text was.
	for (const word of searchWords(query.q))
		matching = matching.where(searchText, 'like', sql<string>`lower(${`%${escapeLike(word)}%`})`);
	if (query.category) matching = matching.where('part.category', '=', query.category);
	if (query.status) matching = matching.where('part.status', '=', query.status);

	const order = `${query.sort}:${query.dir}`;
	const keys: SortKey[] = [
		{
			expression: sql`${sql.ref(sortColumns[query.sort])}`,
			direction: query.dir,
			kind: sortKinds[query.sort]
		},
		{ expression: sql`part.sku`, direction: query.dir, kind: 'text' }
	];
	if (query.sort === 'sku') keys.pop();
	// With a cursor the page starts after it (keyset); a bare `page` number still skips rows, for
	// links made before cursors existed.
	let page = matching
		.select(partColumns)
		.select(keysetSelections(keys))
		.where(keysetAfter(order, keys, query.after))
		.orderBy(keysetOrderBy(keys))
		.limit(query.pageSize + 1);
	if (!query.after && query.page > 1) page = page.offset((query.page - 1) * query.pageSize);
	const { items, next } = keysetPage(order, keys, await page.execute(), query.pageSize);
	const firstPage = !query.after && query.page <= 1;
	const counting = firstPage && !next ? items.length : await countUpToCap(executor, matching);
	const totalCapped = counting > PART_COUNT_CAP;
	const total = Math.min(counting, PART_COUNT_CAP);
	const pages = Math.max(1, Math.ceil(total / query.pageSize));
	return {
		parts: items,
		total,
		totalCapped,
		next,
		page: query.page,
		pageSize: query.pageSize,
		pages: totalCapped && next ? Math.max(pages, query.page + 1) : pages,
		query
	};
}

/** The categories in use, for the filter. */
export async function partCategories(
	channelId: string,
	executor: Executor = db
): Promise<string[]> {
	const rows = await executor
		.selectFrom('part')
		.select('category')
		.distinct()
		.where('channelId', '=', channelId)
		.orderBy('category')
		.execute();
	return rows.map((row) => row.category);
}

/** One part with how many notes and episodes feature it (so the page can say whether it can be removed). */
export async function partDetail(channelId: string, partId: string, executor: Executor = db) {
	if (!isUuid(partId)) throw partNotFound();
	const part = await executor
		.selectFrom('part')
		.select(partColumns)
		.select((eb) => [
			eb
				.selectFrom('segmentNotePart')
				.select((inner) => inner.fn.countAll<number>().as('n'))
				.whereRef('segmentNotePart.partId', '=', 'part.id')
				.as('noteCount'),
			eb
				.selectFrom('trackedLink')
				.select((inner) => inner.fn.countAll<number>().as('n'))
				.whereRef('trackedLink.partId', '=', 'part.id')
				.as('linkCount')
		])
		.where('part.id', '=', partId)
		.where('part.channelId', '=', channelId)
		.executeTakeFirst();
	if (!part) throw partNotFound();
	const episodes = await executor
		.selectFrom('segmentNotePart')
		.innerJoin('segmentNote', 'segmentNote.id', 'segmentNotePart.noteId')
		.innerJoin('episode', 'episode.id', 'segmentNote.episodeId')
		.select(['episode.id', 'episode.title', 'episode.stage'])
		.select((eb) => eb.fn.countAll<number>().as('notes'))
		.where('segmentNotePart.partId', '=', part.id)
		.where('episode.channelId', '=', channelId)
		.groupBy(['episode.id', 'episode.title', 'episode.stage'])
		.orderBy('episode.title')
		.execute();
	return {
		...part,
		noteCount: Number(part.noteCount ?? 0),
		linkCount: Number(part.linkCount ?? 0),
		episodes: episodes.map((episode) => ({ ...episode, notes: Number(episode.notes) }))
	};
}
export type PartDetail = Awaited<ReturnType<typeof partDetail>>;

export const isUniqueViolation = (failure: unknown) =>
	typeof failure === 'object' &&
	failure !== null &&
	(failure as { code?: string }).code === '23505';

function skuTaken(sku: string): DomainError {
	const message = `A part with SKU ${sku} is already in the catalogue; change that part instead, or pick another SKU.`;
	return new DomainError(409, message, { sku: [message] });
}

/** Adds a part; a SKU already in the channel's catalogue is a 409 on the sku field. */
export async function createPart(
	channelId: string,
	input: PartCreate,
	executor: Executor = db
): Promise<CatalogPart> {
	try {
		return await executor
			.insertInto('part')
			.values({
				channelId,
				sku: input.sku,
				name: input.name,
				category: input.category,
				brand: input.brand,
				priceCents: input.price,
				currency: input.currency ?? 'USD',
				storeUrl: input.storeUrl,
				fitmentNote: input.fitmentNote ?? '',
				status: input.status ?? 'active'
			})
			.returning(partColumns)
			.executeTakeFirstOrThrow();
	} catch (failure) {
		if (isUniqueViolation(failure)) throw skuTaken(input.sku);
		throw failure;
	}
}

async function staleOrMissing(
	executor: Executor,
	channelId: string,
	partId: string
): Promise<never> {
	const current = await executor
		.selectFrom('part')
		.select(partColumns)
		.where('id', '=', partId)
		.where('channelId', '=', channelId)
		.executeTakeFirst();
	if (!current) throw partNotFound();
	throw new DomainError(
		409,
		`Someone changed ${current.sku} since you opened it. Their version is shown; make your change again on top of it.`,
		undefined,
		{ current }
	);
}

/** Changes the fields given; the version must be the one the person read (409 with the current part otherwise). */
export async function updatePart(
	channelId: string,
	partId: string,
	input: PartUpdate,
	executor: Executor = db
): Promise<CatalogPart> {
	if (!isUuid(partId)) throw partNotFound();
	const { version, price, ...fields } = input;
	const changes = { ...fields, ...(price !== undefined ? { priceCents: price } : {}) };
	try {
		const row = await executor
			.updateTable('part')
			.set({ ...changes, version: sql<number>`version + 1` })
			.where('id', '=', partId)
			.where('channelId', '=', channelId)
			.where('version', '=', version)
			.returning(partColumns)
			.executeTakeFirst();
		if (!row) return await staleOrMissing(executor, channelId, partId);
		return row;
	} catch (failure) {
		if (isUniqueViolation(failure)) throw skuTaken(input.sku ?? '');
		throw failure;
	}
}

/**
 * Removes a part nobody featured. A part on a note or with a tracked link stays (the episodes
 * keep their history): the answer is 409, and the fix is to retire it as discontinued.
 */
export async function removePart(
	channelId: string,
	partId: string,
	version: number | undefined,
	executor: Executor = db
): Promise<CatalogPart> {
	return executor.transaction().execute(async (trx) => {
		const part = await partDetail(channelId, partId, trx);
		if (version !== undefined && part.version !== version)
			return staleOrMissing(trx, channelId, partId);
		if (part.noteCount > 0 || part.linkCount > 0) {
			const uses = [
				part.noteCount > 0 ? `on ${part.noteCount} note${part.noteCount === 1 ? '' : 's'}` : '',
				part.linkCount > 0
					? `in ${part.linkCount} episode${part.linkCount === 1 ? '’s' : 's’'} tracked links`
					: ''
			]
				.filter(Boolean)
				.join(' and ');
			throw new DomainError(
				409,
				`${part.sku} is ${uses}, so it stays in the catalogue. Set its status to discontinued instead: it is then flagged wherever it is featured.`,
				undefined,
				{ current: part }
			);
		}
		const { noteCount: _notes, linkCount: _links, episodes: _episodes, ...row } = part;
		await trx
			.deleteFrom('part')
			.where('id', '=', partId)
			.where('channelId', '=', channelId)
			.execute();
		return row;
	});
}

/** The id of the part with exactly this SKU in the channel's catalogue; 400 in plain words when none. */
export async function partIdBySku(
	channelId: string,
	sku: string,
	executor: Executor = db
): Promise<string> {
	if (sku.trim() === '') {
		const message = 'Type the part’s SKU (or, with JavaScript, a name or brand and pick the part).';
		throw new DomainError(400, message, { sku: [message] });
	}
	const problem = textProblem(sku, 'The SKU');
	if (problem) throw new DomainError(400, problem, { sku: [problem] });
	const part = await executor
		.selectFrom('part')
		.select('id')
		.where('channelId', '=', channelId)
		.where('sku', '=', sku.trim())
		.executeTakeFirst();
	if (!part) {
		const message = `No part with SKU “${sku.trim()}” is in the catalogue; check the part number, or add the part first.`;
		throw new DomainError(400, message, { sku: [message] });
	}
	return part.id;
}
