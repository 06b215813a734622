/**
 * The parts catalogue: search with server-side paging, sort and filters; create, change (with a
 * version check) and remove or retire; CSV import and export.
 *
 * Search matches every typed word, case-insensitively, anywhere in the part's SKU, name or brand:
 * each word is a LIKE on the stored lower-cased `search_text` column, which the trigram index of
 * the 2026-12-02-08 migration covers, so PostgreSQL answers from that index instead of reading
 * the whole catalogue (scripts/bench-parts.ts measures it at 20,000 parts).
 *
 * CSV import (papaparse, RFC 4180 with the delimiter guessed): the first row names the columns;
 * rows are numbered as a spreadsheet numbers them (the header is row 1). Every row is checked
 * before anything is written; one bad row means nothing is imported. A commit is one transaction
 * of batched statements (1,000 rows each). Create mode adds new parts only; update mode changes
 * the parts whose SKU is in the file (an empty cell leaves that field as it is) and adds the rest.
 */
import Papa from 'papaparse';
import { csvText, unguardCell } from '$lib/csv';
import { sql } from 'kysely';
import { db } from '../db';
import type { PartTable } from '../db/types';
import type { Selectable } from 'kysely';
import { DomainError, notFound } from '../http/api';
import { isUuid } from '../auth/identity';
import type { Executor } from '../episodes/episodes';
import {
	IMPORT_FIELDS,
	IMPORT_FIELD_LABELS,
	PART_LIMITS,
	REQUIRED_IMPORT_FIELDS,
	readCurrency,
	readPrice,
	readStatus,
	readStoreUrl,
	readText,
	type FieldReading,
	type ImportField,
	type ImportMapping,
	type ImportRequest,
	type PartCreate,
	type PartSearch,
	type PartSort,
	type PartStatusValue,
	type PartUpdate
} from '$lib/schemas/parts';
import { textProblem } from '$lib/schemas/fields';

export const partNotFound = () => notFound('That part');

const partColumns = [
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
	total: number;
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

/** The words of a search, at most 8 of them (more add nothing but work). */
export function searchWords(q: string | undefined): string[] {
	return (q ?? '').split(/\s+/).filter(Boolean).slice(0, 8);
}

/** One page of the catalogue and how many parts match in all; the page and the count run side by side. */
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

	const direction = query.dir;
	const column = sortColumns[query.sort];
	let page = matching.select(partColumns).orderBy(column, direction);
	if (column !== 'part.sku') page = page.orderBy('part.sku', direction);
	const [parts, counted] = await Promise.all([
		page
			.limit(query.pageSize)
			.offset((query.page - 1) * query.pageSize)
			.execute(),
		matching.select((eb) => eb.fn.countAll<number>().as('total')).executeTakeFirstOrThrow()
	]);
	const total = Number(counted.total);
	return {
		parts,
		total,
		page: query.page,
		pageSize: query.pageSize,
		pages: Math.max(1, Math.ceil(total / query.pageSize)),
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

const isUniqueViolation = (failure: unknown) =>
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
			.returningAll()
			.executeTakeFirstOrThrow()
			.then(pickPart);
	} catch (failure) {
		if (isUniqueViolation(failure)) throw skuTaken(input.sku);
		throw failure;
	}
}

function pickPart(row: Selectable<PartTable>): CatalogPart {
	const {
		id,
		sku,
		name,
		category,
		brand,
		priceCents,
		currency,
		storeUrl,
		fitmentNote,
		status,
		version
	} = row;
	return {
		id,
		sku,
		name,
		category,
		brand,
		priceCents,
		currency,
		storeUrl,
		fitmentNote,
		status,
		version
	};
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
			.returningAll()
			.executeTakeFirst();
		if (!row) return await staleOrMissing(executor, channelId, partId);
		return pickPart(row);
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

// ---------------------------------------------------------------- CSV import

export interface ImportRowError {
	/** Spreadsheet row number: the header is row 1, the first part row 2. */
	row: number;
	field: ImportField | null;
	message: string;
}

export interface ImportSampleRow {
	row: number;
	action: 'create' | 'update' | 'unchanged' | 'error';
	values: Partial<Record<ImportField, string>>;
}

export interface ImportPreview {
	mode: 'create' | 'update';
	headers: string[];
	/** Field → column header, as guessed or as given; null for a field not in the file. */
	mapping: Record<ImportField, string | null>;
	/** Fields a new part needs that no column is mapped to. */
	missingFields: ImportField[];
	rowCount: number;
	creates: number;
	updates: number;
	errorCount: number;
	/** The first 500 errors, by row. */
	errors: ImportRowError[];
	/** The first 20 rows as they will be read. */
	sample: ImportSampleRow[];
}

export interface ImportResult {
	mode: 'create' | 'update';
	rowCount: number;
	created: number;
	updated: number;
	unchanged: number;
	milliseconds: number;
}

/** Rows written per INSERT or UPDATE statement. */
export const IMPORT_BATCH_ROWS = 1000;
const MAX_REPORTED_ERRORS = 500;
const SAMPLE_ROWS = 20;

/** Header words (lower case, letters and digits only) each field is guessed from. */
const HEADER_GUESSES: Record<ImportField, string[]> = {
	sku: ['sku', 'partnumber', 'partno', 'partnum', 'part', 'itemnumber', 'itemno', 'pn'],
	name: ['name', 'partname', 'productname', 'title', 'product', 'item'],
	category: ['category', 'type', 'group', 'partcategory'],
	brand: ['brand', 'make', 'maker', 'manufacturer'],
	price: ['price', 'priceusd', 'unitprice', 'retailprice', 'listprice'],
	currency: ['currency', 'currencycode', 'cur'],
	storeUrl: [
		'storeurl',
		'url',
		'link',
		'shopurl',
		'producturl',
		'storelink',
		'shoplink',
		'weblink'
	],
	fitmentNote: ['fitmentnote', 'fitment', 'fits', 'fitmentnotes', 'notes', 'note'],
	status: ['status', 'availability', 'stockstatus']
};

const headerKey = (header: string) => header.toLowerCase().replace(/[^a-z0-9]/g, '');

/** Guesses which column holds each field from the header words. */
export function guessMapping(headers: readonly string[]): Record<ImportField, string | null> {
	const keys = headers.map(headerKey);
	const mapping = {} as Record<ImportField, string | null>;
	const used = new Set<number>();
	for (const field of IMPORT_FIELDS) {
		const index = HEADER_GUESSES[field]
			.map((guess) => keys.findIndex((key, at) => key === guess && !used.has(at)))
			.find((at) => at >= 0);
		mapping[field] = index === undefined ? null : headers[index];
		if (index !== undefined) used.add(index);
	}
	return mapping;
}

interface ParsedFile {
	headers: string[];
	/** Data records with their spreadsheet row number. */
	records: { row: number; cells: string[] }[];
	fileErrors: ImportRowError[];
}

function parseFile(csv: string): ParsedFile {
	const text = csv.replace(/^\uFEFF/, '');
	const parsed = Papa.parse<string[]>(text, { header: false, skipEmptyLines: false });
	const fileErrors: ImportRowError[] = parsed.errors
		// papaparse warns when it can only guess the delimiter of a one-column file; that isn't the person's mistake.
		.filter((problem) => problem.code !== 'UndetectableDelimiter')
		.map((problem) => ({
			row: (problem.row ?? 0) + 1,
			field: null,
			message: `The file can’t be read here: ${problem.message.toLowerCase()}.`
		}));
	const rows = parsed.data;
	const headerIndex = rows.findIndex((cells) => cells.some((cell) => cell.trim() !== ''));
	if (headerIndex < 0)
		return {
			headers: [],
			records: [],
			fileErrors: [
				{
					row: 1,
					field: null,
					message: 'The file is empty: the first row should name the columns (sku, name, …).'
				}
			]
		};
	const headers = rows[headerIndex].map((cell) => cell.trim());
	const records: ParsedFile['records'] = [];
	for (let index = headerIndex + 1; index < rows.length; index++) {
		const cells = rows[index];
		if (cells.every((cell) => cell.trim() === '')) continue;
		// A cell our export guarded against spreadsheet formulas ('=…, '+…) reads back as it was.
		records.push({ row: index + 1, cells: cells.map(unguardCell) });
	}
	return { headers, records, fileErrors };
}

interface ReadRow {
	row: number;
	sku: string;
	values: Partial<Record<ImportField, string>>;
	part: Partial<{
		name: string;
		category: string;
		brand: string;
		priceCents: number;
		currency: string;
		storeUrl: string;
		fitmentNote: string;
		status: PartStatusValue;
	}>;
}

interface Analysis {
	preview: ImportPreview;
	creates: (ReadRow & { part: Required<ReadRow['part']> })[];
	updates: ReadRow[];
}

const readers: Record<
	Exclude<ImportField, 'sku'>,
	(text: string) => FieldReading<string | number>
> = {
	name: (text) => readText('name', text, PART_LIMITS.name),
	category: (text) => readText('category', text, PART_LIMITS.category),
	brand: (text) => readText('brand', text, PART_LIMITS.brand),
	price: readPrice,
	currency: readCurrency,
	storeUrl: readStoreUrl,
	fitmentNote: (text) => readText('fitment note', text, PART_LIMITS.fitmentNote, false),
	status: readStatus
};

const partKey: Record<Exclude<ImportField, 'sku'>, keyof ReadRow['part']> = {
	name: 'name',
	category: 'category',
	brand: 'brand',
	price: 'priceCents',
	currency: 'currency',
	storeUrl: 'storeUrl',
	fitmentNote: 'fitmentNote',
	status: 'status'
};

function resolveMapping(
	headers: string[],
	given: ImportMapping | undefined
): Record<ImportField, string | null> {
	if (!given) return guessMapping(headers);
	const mapping = {} as Record<ImportField, string | null>;
	for (const field of IMPORT_FIELDS) {
		const header = given[field] ?? null;
		if (header !== null && header !== '' && !headers.includes(header)) {
			const message = `The file has no column “${header}” for ${IMPORT_FIELD_LABELS[field]}; pick one of its columns: ${headers.join(', ')}.`;
			throw new DomainError(400, message, { [`mapping.${field}`]: [message] });
		}
		mapping[field] = header === '' ? null : header;
	}
	return mapping;
}

/** Reads and checks every row against the catalogue as it is now (in the caller's transaction for a commit). */
async function analyseImport(
	executor: Executor,
	channelId: string,
	request: Pick<ImportRequest, 'csv' | 'mode' | 'mapping'>
): Promise<Analysis> {
	const { headers, records, fileErrors } = parseFile(request.csv);
	const mapping = resolveMapping(headers, request.mapping);
	const mode = request.mode;
	const columnOf = Object.fromEntries(
		IMPORT_FIELDS.map((field) => [
			field,
			mapping[field] === null ? -1 : headers.indexOf(mapping[field]!)
		])
	) as Record<ImportField, number>;
	const missingFields = REQUIRED_IMPORT_FIELDS.filter((field) => columnOf[field] < 0);
	const errors: ImportRowError[] = [...fileErrors];
	if (columnOf.sku < 0)
		errors.push({
			row: 1,
			field: 'sku',
			message: 'No column is mapped to the SKU: every row needs its part number.'
		});
	else if (mode === 'create' && missingFields.length > 0) {
		errors.push({
			row: 1,
			field: missingFields[0],
			message: `New parts need ${missingFields.map((field) => IMPORT_FIELD_LABELS[field]).join(', ')}: map a column to ${missingFields.length === 1 ? 'it' : 'each'}.`
		});
	}

	const skus =
		columnOf.sku < 0
			? []
			: records.map((record) => (record.cells[columnOf.sku] ?? '').trim()).filter(Boolean);
	const existing = new Map<
		string,
		{
			id: string;
			name: string;
			category: string;
			brand: string;
			priceCents: number;
			currency: string;
			storeUrl: string;
			fitmentNote: string;
			status: PartStatusValue;
		}
	>();
	for (let start = 0; start < skus.length; start += 10_000) {
		const rows = await executor
			.selectFrom('part')
			.select([
				'id',
				'sku',
				'name',
				'category',
				'brand',
				'priceCents',
				'currency',
				'storeUrl',
				'fitmentNote',
				'status'
			])
			.where('channelId', '=', channelId)
			.where('sku', '=', sql<string>`ANY(${skus.slice(start, start + 10_000)}::text[])`)
			.execute();
		for (const { sku, ...row } of rows) existing.set(sku, row);
	}

	const firstRowOf = new Map<string, number>();
	const creates: Analysis['creates'] = [];
	const updates: ReadRow[] = [];
	const sample: ImportSampleRow[] = [];
	const canRead = columnOf.sku >= 0 && !(mode === 'create' && missingFields.length > 0);

	for (const record of records) {
		const values: Partial<Record<ImportField, string>> = {};
		for (const field of IMPORT_FIELDS)
			if (columnOf[field] >= 0) values[field] = record.cells[columnOf[field]] ?? '';
		const rowErrors: ImportRowError[] = [];
		const fail = (field: ImportField | null, message: string) =>
			rowErrors.push({ row: record.row, field, message: `Row ${record.row}: ${message}` });
		if (
			record.cells.length > headers.length &&
			record.cells.slice(headers.length).some((cell) => cell.trim() !== '')
		) {
			fail(
				null,
				`it has ${record.cells.length} cells but the header names ${headers.length} columns; check for an unquoted comma.`
			);
		}
		let action: ImportSampleRow['action'] = 'error';
		if (canRead) {
			const skuReading = readText('SKU', values.sku, PART_LIMITS.sku);
			const sku = skuReading.ok ? skuReading.value : '';
			if (!skuReading.ok) fail('sku', skuReading.message);
			else if (firstRowOf.has(sku))
				fail(
					'sku',
					`SKU ${sku} is in the file twice (first on row ${firstRowOf.get(sku)}); keep one row per part.`
				);
			else firstRowOf.set(sku, record.row);
			const current = sku ? existing.get(sku) : undefined;
			if (skuReading.ok && mode === 'create' && current)
				fail('sku', `SKU ${sku} is already in the catalogue; use update mode to change it.`);
			const isUpdate = mode === 'update' && current !== undefined;
			if (mode === 'update' && !current && missingFields.length > 0 && skuReading.ok) {
				fail(
					missingFields[0],
					`SKU ${sku} isn’t in the catalogue, and a new part needs ${missingFields.map((field) => IMPORT_FIELD_LABELS[field]).join(', ')}, which this file has no column for.`
				);
			}
			const part: ReadRow['part'] = {};
			for (const field of IMPORT_FIELDS) {
				if (field === 'sku' || columnOf[field] < 0) continue;
				const text = values[field] ?? '';
				// Updating, an empty cell means "leave it as it is".
				if (isUpdate && text.trim() === '') continue;
				const reading = readers[field](text);
				if (reading.ok) (part as Record<string, unknown>)[partKey[field]] = reading.value;
				else fail(field, reading.message);
			}
			if (rowErrors.length === 0) {
				if (isUpdate) {
					const changed = (Object.keys(part) as (keyof ReadRow['part'])[]).some(
						(key) => part[key] !== current[key]
					);
					action = changed ? 'update' : 'unchanged';
					if (changed) updates.push({ row: record.row, sku, values, part });
				} else {
					action = 'create';
					creates.push({
						row: record.row,
						sku,
						values,
						part: { currency: 'USD', fitmentNote: '', status: 'active', ...part } as Required<
							ReadRow['part']
						>
					});
				}
			}
		}
		errors.push(...rowErrors);
		if (sample.length < SAMPLE_ROWS) sample.push({ row: record.row, action, values });
	}
	if (records.length === 0 && errors.length === 0)
		errors.push({
			row: 2,
			field: null,
			message: 'The file has a header row but no parts under it.'
		});
	errors.sort((a, b) => a.row - b.row);
	return {
		preview: {
			mode,
			headers,
			mapping,
			missingFields,
			rowCount: records.length,
			creates: creates.length,
			updates: updates.length,
			errorCount: errors.length,
			errors: errors.slice(0, MAX_REPORTED_ERRORS),
			sample
		},
		creates,
		updates
	};
}

/** What an import would do, without writing anything. */
export async function previewPartImport(
	channelId: string,
	request: Pick<ImportRequest, 'csv' | 'mode' | 'mapping'>,
	executor: Executor = db
): Promise<ImportPreview> {
	return (await analyseImport(executor, channelId, request)).preview;
}

/**
 * Imports the file in one transaction, or nothing at all: any row error answers 422 with the
 * preview (errors by row), and a clash with a part added meanwhile rolls everything back (409).
 */
export async function commitPartImport(
	channelId: string,
	request: Pick<ImportRequest, 'csv' | 'mode' | 'mapping'>,
	executor: Executor = db
): Promise<ImportResult> {
	const started = performance.now();
	try {
		return await executor.transaction().execute(async (trx) => {
			const { preview, creates, updates } = await analyseImport(trx, channelId, request);
			if (preview.errorCount > 0) {
				throw new DomainError(
					422,
					`Nothing was imported: ${preview.errorCount} problem${preview.errorCount === 1 ? '' : 's'} in the file. Fix ${preview.errorCount === 1 ? 'it' : 'them'} and import again.`,
					undefined,
					{ preview }
				);
			}
			for (let start = 0; start < creates.length; start += IMPORT_BATCH_ROWS) {
				await trx
					.insertInto('part')
					.values(
						creates
							.slice(start, start + IMPORT_BATCH_ROWS)
							.map(({ sku, part }) => ({ channelId, sku, ...part }))
					)
					.execute();
			}
			let updated = 0;
			for (let start = 0; start < updates.length; start += IMPORT_BATCH_ROWS) {
				updated += await updateBatch(
					trx,
					channelId,
					updates.slice(start, start + IMPORT_BATCH_ROWS)
				);
			}
			return {
				mode: request.mode,
				rowCount: preview.rowCount,
				created: creates.length,
				updated,
				unchanged: preview.rowCount - creates.length - updated,
				milliseconds: Math.round(performance.now() - started)
			};
		});
	} catch (failure) {
		if (isUniqueViolation(failure)) {
			throw new DomainError(
				409,
				'Someone added a part with one of these SKUs while the file was importing. Nothing was imported; preview the file again.'
			);
		}
		throw failure;
	}
}

/** One UPDATE … FROM jsonb_to_recordset for up to 1,000 rows; a null value keeps the current one. */
async function updateBatch(trx: Executor, channelId: string, rows: ReadRow[]): Promise<number> {
	const records = rows.map(({ sku, part }) => ({
		sku,
		name: part.name ?? null,
		category: part.category ?? null,
		brand: part.brand ?? null,
		price_cents: part.priceCents ?? null,
		currency: part.currency ?? null,
		store_url: part.storeUrl ?? null,
		fitment_note: part.fitmentNote ?? null,
		status: part.status ?? null
	}));
	const result = await sql`
		UPDATE part SET
			name = COALESCE(v.name, part.name),
			category = COALESCE(v.category, part.category),
			brand = COALESCE(v.brand, part.brand),
			price_cents = COALESCE(v.price_cents, part.price_cents),
			currency = COALESCE(v.currency, part.currency),
			store_url = COALESCE(v.store_url, part.store_url),
			fitment_note = COALESCE(v.fitment_note, part.fitment_note),
			status = COALESCE(v.status, part.status),
			version = part.version + 1
		FROM jsonb_to_recordset(${JSON.stringify(records)}::jsonb)
			AS v(sku text, name text, category text, brand text, price_cents integer, currency text, store_url text, fitment_note text, status text)
		WHERE part.channel_id = ${channelId} AND part.sku = v.sku`.execute(trx);
	return Number(result.numAffectedRows ?? 0);
}

// ---------------------------------------------------------------- CSV export

/** Column headers of the export; the import guesses each of them back to its field. */
export const EXPORT_HEADERS: Record<ImportField, string> = {
	sku: 'sku',
	name: 'name',
	category: 'category',
	brand: 'brand',
	price: 'price',
	currency: 'currency',
	storeUrl: 'store_url',
	fitmentNote: 'fitment_note',
	status: 'status'
};

/**
 * The whole catalogue as CSV (RFC 4180: CRLF line ends, quoted where needed), sorted by SKU. It is
 * opened in spreadsheets, so cells that would run as a formula are guarded (see `$lib/csv`); the
 * import takes the guard off again.
 */
export async function exportPartsCsv(channelId: string, executor: Executor = db): Promise<string> {
	const parts = await executor
		.selectFrom('part')
		.select(partColumns)
		.where('channelId', '=', channelId)
		.orderBy('sku')
		.execute();
	return csvText(
		[
			IMPORT_FIELDS.map((field) => EXPORT_HEADERS[field]),
			...parts.map((part) => [
				part.sku,
				part.name,
				part.category,
				part.brand,
				priceText(part.priceCents),
				part.currency,
				part.storeUrl,
				part.fitmentNote,
				part.status
			])
		],
		{ escapeFormulae: true }
	);
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
