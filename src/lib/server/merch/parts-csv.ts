/**
 * The parts catalogue as a CSV file (papaparse, RFC 4180 with the delimiter guessed): the export,
 * and reading an import file into its header and rows, with the column each field is read from
 * (guessed from the header words, or as the person mapped it). Rows are numbered as a spreadsheet
 * numbers them (the header is row 1).
 */
import Papa from 'papaparse';
import { csvText, unguardCell } from '$lib/csv';
import { db } from '../db';
import { DomainError } from '../http/api';
import type { Executor } from '../episodes/episodes';
import {
	IMPORT_FIELDS,
	IMPORT_FIELD_LABELS,
	type ImportField,
	type ImportMapping
} from '$lib/schemas/parts';
import { partColumns, priceText } from './parts';

export interface ImportRowError {
	/** Spreadsheet row number: the header is row 1, the first part row 2. */
	row: number;
	field: ImportField | null;
	message: string;
}

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

export interface ParsedFile {
	headers: string[];
	/** Data records with their spreadsheet row number. */
	records: { row: number; cells: string[] }[];
	fileErrors: ImportRowError[];
}

export function parseFile(csv: string): ParsedFile {
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

/** The column each field is read from: as the person mapped it, or guessed from the header. */
export function resolveMapping(
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
