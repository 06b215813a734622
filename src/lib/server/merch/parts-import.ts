/**
 * Writing a parts import: one transaction of batched statements (1,000 rows each), or nothing at
 * all. The rows are checked again inside the transaction (parts-import-preview.ts), so the file is
 * written against the catalogue as it is then.
 */
import { sql } from 'kysely';
import { db } from '../db';
import { DomainError } from '../http/api';
import type { Executor } from '../episodes/episodes';
import type { ImportRequest } from '$lib/schemas/parts';
import { isUniqueViolation } from './parts';
import { analyseImport, type ReadRow } from './parts-import-preview';

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
