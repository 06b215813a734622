/**
 * What a parts import would do: every row of the file is read and checked against the catalogue
 * as it is now, before anything is written; one bad row means nothing is imported. Create mode
 * adds new parts only; update mode changes the parts whose SKU is in the file (an empty cell
 * leaves that field as it is) and adds the rest. parts-import.ts writes what this finds.
 */
import { sql } from 'kysely';
import { db } from '../db';
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
	type ImportRequest,
	type PartStatusValue
} from '$lib/schemas/parts';
import { parseFile, resolveMapping, type ImportRowError } from './parts-csv';

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

const MAX_REPORTED_ERRORS = 500;
const SAMPLE_ROWS = 20;

/** The fields of a part a row of the file sets (all but the SKU, which names the part). */
interface PartFields {
	name: string;
	category: string;
	brand: string;
	priceCents: number;
	currency: string;
	storeUrl: string;
	fitmentNote: string;
	status: PartStatusValue;
}

export interface ReadRow {
	row: number;
	sku: string;
	values: Partial<Record<ImportField, string>>;
	part: Partial<PartFields>;
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

/** Reads and checks every row against the catalogue as it is now (in the caller's transaction for a commit). */
export async function analyseImport(
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
	const existing = new Map<string, PartFields & { id: string }>();
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
