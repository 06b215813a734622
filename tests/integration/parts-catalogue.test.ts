/**
 * The parts catalogue over HTTP against the built server: search with paging, sort and filters;
 * create, change and remove with version checks; CSV import (good and bad files, a 20,000-row
 * file, update by SKU) and CSV export.
 *
 * Outside sources for the checks:
 * - CSV: RFC 4180 (CRLF line ends, quoted fields with doubled quotes), read and written here by
 *   the reference library `papaparse`, independently of the server's own use of it.
 * - One transaction: PostgreSQL stamps every row version with the id of the transaction that
 *   wrote it (`xmin`, PostgreSQL documentation "System Columns"), so rows of one import share one.
 * - Sort order: the test cluster is created with the C.UTF-8 locale (scripts/lib/postgres.ts),
 *   which orders text by code point, the order of JavaScript's default string comparison for ASCII.
 * - URLs: the WHATWG URL Standard (Node's `URL`) decides what is a web address.
 */
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let merch: Visitor;
let host: Visitor;
let channelId: string;
const catalogueCount = async () =>
	Number(
		(await sql(`SELECT count(*)::int AS n FROM part WHERE channel_id = $1`, [channelId]))[0].n
	);

beforeAll(async () => {
	merch = await signedIn(demo.merch);
	host = await signedIn(demo.host);
	channelId = (await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`))[0].id;
});

afterAll(async () => {
	await sql(`DELETE FROM part WHERE channel_id = $1 AND (sku LIKE 'BULK-%' OR sku LIKE 'TEST-%')`, [
		channelId
	]);
});

const csvOf = (rows: (string | number)[][]) => Papa.unparse(rows, { newline: '\r\n' });
const importCsv = (
	visitor: Visitor,
	action: 'preview' | 'commit',
	mode: 'create' | 'update',
	csv: string,
	mapping?: Record<string, string | null>
) =>
	visitor.api('/api/parts/import', {
		method: 'POST',
		json: { action, mode, csv, ...(mapping ? { mapping } : {}) }
	});

describe('catalogue search', () => {
	test('pages of 10 cover the demo catalogue exactly once, in SKU order', async () => {
		const all = await sql<{ sku: string }>(`SELECT sku FROM part WHERE channel_id = $1`, [
			channelId
		]);
		const first = await host.api('/api/parts?pageSize=10');
		expect(first.status).toBe(200);
		expect(first.body.total).toBe(all.length);
		expect(first.body.pages).toBe(Math.ceil(all.length / 10));
		const seen: string[] = [];
		for (let page = 1; page <= first.body.pages; page++) {
			const answer = await host.api(`/api/parts?pageSize=10&page=${page}`);
			expect(answer.body.parts.length).toBe(
				page < first.body.pages ? 10 : all.length - 10 * (first.body.pages - 1)
			);
			seen.push(...answer.body.parts.map((part: { sku: string }) => part.sku));
		}
		// Code-point order (C.UTF-8 collation), the same as JavaScript's default sort for these ASCII SKUs.
		expect(seen).toEqual(all.map((row) => row.sku).sort());
	});

	test('every typed word must match the SKU, name or brand, ignoring case', async () => {
		const answer = await host.api(`/api/parts?q=${encodeURIComponent('COIL spacer')}`);
		expect(answer.status).toBe(200);
		const skus = answer.body.parts.map((part: { sku: string }) => part.sku);
		expect(skus).toEqual(expect.arrayContaining(['KBS-CS-150', 'KBS-CS-200']));
		for (const part of answer.body.parts) {
			const text = `${part.sku} ${part.name} ${part.brand}`.toLowerCase();
			expect(text).toContain('coil');
			expect(text).toContain('spacer');
		}
		const byBrand = await host.api('/api/parts?q=quillon');
		expect(
			byBrand.body.parts.every((part: { brand: string }) => part.brand === 'Quillon Shocks')
		).toBe(true);
		expect(byBrand.body.total).toBe(4);
	});

	test('LIKE wildcards typed into the search are searched for literally', async () => {
		expect((await host.api(`/api/parts?q=${encodeURIComponent('%')}`)).body.total).toBe(0);
		expect((await host.api(`/api/parts?q=${encodeURIComponent('IBS_LB')}`)).body.total).toBe(0);
	});

	test('filters and sorts combine: tyres by price, dearest first; status filter', async () => {
		const tyres = await host.api('/api/parts?category=Tyres&sort=price&dir=desc');
		const prices = tyres.body.parts.map((part: { priceCents: number }) => part.priceCents);
		expect(prices.length).toBe(4);
		expect(prices).toEqual([...prices].sort((a: number, b: number) => b - a));
		const discontinued = await host.api('/api/parts?status=discontinued');
		expect(discontinued.body.parts.map((part: { sku: string }) => part.sku)).toEqual([
			'KBS-BL-OLD'
		]);
	});

	test('a bad query answers 400 naming the field', async () => {
		const answer = await host.api('/api/parts?sort=colour&pageSize=5000');
		expect(answer.status).toBe(400);
		expect(Object.keys(answer.body.issues)).toEqual(expect.arrayContaining(['sort', 'pageSize']));
	});
});

describe('changing the catalogue', () => {
	test('the merch team adds a part; the same SKU again is a 409 on the sku field', async () => {
		const part = {
			sku: 'TEST-NEW-1',
			name: 'Test bump stop pair',
			category: 'Bump stops',
			brand: 'Kingbolt Suspension',
			price: '1,299.5',
			storeUrl: 'https://shop.torquehaven.test/p/test-new-1'
		};
		const created = await merch.api('/api/parts', { method: 'POST', json: part });
		expect(created.status).toBe(201);
		// 1,299.5 → 129,950 cents: a thousands comma and one decimal digit.
		expect(created.body.part).toMatchObject({
			sku: 'TEST-NEW-1',
			priceCents: 129950,
			currency: 'USD',
			status: 'active',
			version: 1
		});
		const again = await merch.api('/api/parts', { method: 'POST', json: part });
		expect(again.status).toBe(409);
		expect(again.body.issues.sku[0]).toContain('TEST-NEW-1');
	});

	test('a bad price or a non-web address is refused in words', async () => {
		const answer = await merch.api('/api/parts', {
			method: 'POST',
			json: {
				sku: 'TEST-BAD',
				name: 'x',
				category: 'x',
				brand: 'x',
				price: '12,5',
				storeUrl: 'ftp://shop.test/x'
			}
		});
		expect(answer.status).toBe(400);
		expect(answer.body.issues.price[0]).toMatch(/isn't a price/);
		expect(answer.body.issues.storeUrl[0]).toMatch(/https:\/\//);
	});

	test('a change names the version it read; a stale one answers 409 with the current part', async () => {
		const created = (
			await merch.api('/api/parts', {
				method: 'POST',
				json: {
					sku: 'TEST-VER',
					name: 'Versioned',
					category: 'Test',
					brand: 'Test',
					price: 10,
					storeUrl: 'https://shop.test/v'
				}
			})
		).body.part;
		const first = await merch.api(`/api/parts/${created.id}`, {
			method: 'PATCH',
			json: { version: 1, price: '12.00' }
		});
		expect(first.status).toBe(200);
		expect(first.body.part).toMatchObject({ priceCents: 1200, version: 2 });
		const stale = await merch.api(`/api/parts/${created.id}`, {
			method: 'PATCH',
			json: { version: 1, name: 'Lost edit' }
		});
		expect(stale.status).toBe(409);
		expect(stale.body.current).toMatchObject({ name: 'Versioned', version: 2 });
	});

	test('a part nobody featured is removed; a featured one stays (409) and is retired instead', async () => {
		const spare = (
			await merch.api('/api/parts', {
				method: 'POST',
				json: {
					sku: 'TEST-GONE',
					name: 'Spare',
					category: 'Test',
					brand: 'Test',
					price: 1,
					storeUrl: 'https://shop.test/g'
				}
			})
		).body.part;
		expect((await merch.api(`/api/parts/${spare.id}?version=1`, { method: 'DELETE' })).status).toBe(
			200
		);
		expect(await sql(`SELECT id FROM part WHERE id = $1`, [spare.id])).toEqual([]);
		const [featured] = await sql(
			`SELECT id, version FROM part WHERE channel_id = $1 AND sku = 'KBS-LB-300T'`,
			[channelId]
		);
		const refused = await merch.api(`/api/parts/${featured.id}`, { method: 'DELETE' });
		expect(refused.status).toBe(409);
		expect(refused.body.error).toMatch(/discontinued/);
		expect((await sql(`SELECT version FROM part WHERE id = $1`, [featured.id]))[0].version).toBe(
			featured.version
		);
	});
});

describe('CSV import', () => {
	test('a good file: headers guessed, quoted commas and a byte-order mark read, prices in cents', async () => {
		const csv =
			'\uFEFF' +
			csvOf([
				['Part Number', 'Name', 'Category', 'Brand', 'Price', 'Store URL', 'Fitment', 'Status'],
				[
					'TEST-CSV-1',
					'Shackle bushing set, "poly"',
					'Shackles',
					'Kingbolt Suspension',
					'24.5',
					'https://shop.test/p/1?ref=csv#top',
					'Fits 2.5 in, and 3 in eyes',
					''
				],
				[
					'TEST-CSV-2',
					'Sway bar link pair, +2 in',
					'Steering',
					'Cobalt Steer',
					'$41.00',
					'https://shop.test/p/2',
					'',
					'out of stock'
				]
			]);
		const preview = await importCsv(merch, 'preview', 'create', csv);
		expect(preview.status).toBe(200);
		expect(preview.body.preview).toMatchObject({
			rowCount: 2,
			creates: 2,
			updates: 0,
			errorCount: 0,
			missingFields: []
		});
		expect(preview.body.preview.mapping).toMatchObject({
			sku: 'Part Number',
			price: 'Price',
			storeUrl: 'Store URL',
			fitmentNote: 'Fitment',
			currency: null
		});
		expect(await sql(`SELECT id FROM part WHERE sku LIKE 'TEST-CSV-%'`)).toEqual([]);

		const committed = await importCsv(merch, 'commit', 'create', csv);
		expect(committed.status).toBe(200);
		expect(committed.body.result).toMatchObject({ created: 2, updated: 0 });
		const rows = await sql(
			`SELECT sku, name, price_cents, currency, store_url, fitment_note, status FROM part WHERE sku LIKE 'TEST-CSV-%' ORDER BY sku`
		);
		expect(rows).toEqual([
			{
				sku: 'TEST-CSV-1',
				name: 'Shackle bushing set, "poly"',
				price_cents: 2450,
				currency: 'USD',
				store_url: 'https://shop.test/p/1?ref=csv#top',
				fitment_note: 'Fits 2.5 in, and 3 in eyes',
				status: 'active'
			},
			{
				sku: 'TEST-CSV-2',
				name: 'Sway bar link pair, +2 in',
				price_cents: 4100,
				currency: 'USD',
				store_url: 'https://shop.test/p/2',
				fitment_note: '',
				status: 'out_of_stock'
			}
		]);
	});

	test('a bad file: each problem by spreadsheet row number, and nothing is imported', async () => {
		const before = await catalogueCount();
		const csv = csvOf([
			['sku', 'name', 'category', 'brand', 'price', 'store_url'],
			['TEST-BAD-1', 'Good row', 'Test', 'Test', '10.00', 'https://shop.test/1'],
			['TEST-BAD-2', 'Comma price', 'Test', 'Test', '10,50', 'https://shop.test/2'],
			['TEST-BAD-3', 'No scheme', 'Test', 'Test', '10.00', 'shop.test/3'],
			['TEST-BAD-1', 'Same SKU again', 'Test', 'Test', '10.00', 'https://shop.test/4'],
			['KBS-LB-300', 'Already in the catalogue', 'Test', 'Test', '10.00', 'https://shop.test/5'],
			['', 'No SKU', 'Test', 'Test', '10.00', 'https://shop.test/6']
		]);
		const preview = (await importCsv(merch, 'preview', 'create', csv)).body.preview;
		// Header = row 1, so the data rows are 2…7.
		expect(
			preview.errors.map((error: { row: number; field: string }) => [error.row, error.field])
		).toEqual([
			[3, 'price'],
			[4, 'storeUrl'],
			[5, 'sku'],
			[6, 'sku'],
			[7, 'sku']
		]);
		expect(preview.errors[2].message).toMatch(/twice \(first on row 2\)/);
		expect(preview.errors[3].message).toMatch(/already in the catalogue/);
		const refused = await importCsv(merch, 'commit', 'create', csv);
		expect(refused.status).toBe(422);
		expect(refused.body.preview.errorCount).toBe(5);
		expect(await catalogueCount()).toBe(before);
		expect(await sql(`SELECT id FROM part WHERE sku = 'TEST-BAD-1'`)).toEqual([]);
	});

	test('a mapping naming a column the file lacks is a 400; a missing required column blocks a create', async () => {
		const csv = csvOf([
			['sku', 'name'],
			['TEST-MAP-1', 'Name only']
		]);
		const wrong = await importCsv(merch, 'preview', 'create', csv, { sku: 'part_no' });
		expect(wrong.status).toBe(400);
		expect(wrong.body.issues['mapping.sku'][0]).toMatch(/no column “part_no”/);
		const preview = (await importCsv(merch, 'preview', 'create', csv)).body.preview;
		expect(preview.missingFields).toEqual(['category', 'brand', 'price', 'storeUrl']);
		expect(preview.errorCount).toBe(1);
	});

	test('20,000 rows go in as one transaction; a file with one bad row leaves the catalogue unchanged', async () => {
		const header = [
			'sku',
			'name',
			'category',
			'brand',
			'price',
			'currency',
			'store_url',
			'fitment_note',
			'status'
		];
		const rows = Array.from({ length: 20_000 }, (_, index) => [
			`BULK-${String(index).padStart(5, '0')}`,
			`Bulk test bracket ${index}, size ${index % 7}`,
			['Brackets', 'Hardware', 'Bushings'][index % 3],
			['Kingbolt Suspension', 'Cobalt Steer'][index % 2],
			`${10 + (index % 90)}.${String(index % 100).padStart(2, '0')}`,
			'USD',
			`https://shop.torquehaven.test/p/bulk-${index}?ref=import`,
			index % 11 === 0 ? 'Check clearance, then torque.' : '',
			index % 13 === 0 ? 'out_of_stock' : 'active'
		]);
		const before = await catalogueCount();

		const broken = rows.map((row) => [...row]);
		broken[19_998][4] = 'twelve dollars';
		const refused = await importCsv(merch, 'commit', 'create', csvOf([header, ...broken]));
		expect(refused.status).toBe(422);
		// Data row 19,998 (0-based) is spreadsheet row 20,000.
		expect(refused.body.preview.errors).toEqual([
			expect.objectContaining({ row: 20_000, field: 'price' })
		]);
		expect(await catalogueCount()).toBe(before);

		const started = performance.now();
		const committed = await importCsv(merch, 'commit', 'create', csvOf([header, ...rows]));
		const wall = performance.now() - started;
		expect(committed.status, JSON.stringify(committed.body).slice(0, 300)).toBe(200);
		console.log(
			`CSV import of 20,000 rows: ${committed.body.result.milliseconds} ms in the server, ${wall.toFixed(0)} ms for the whole request`
		);
		expect(committed.body.result).toMatchObject({ created: 20_000, updated: 0 });
		expect(await catalogueCount()).toBe(before + 20_000);
		// PostgreSQL "System Columns": xmin is the writing transaction's id; one import, one id.
		const transactions = await sql(
			`SELECT count(DISTINCT xmin::text)::int AS n FROM part WHERE sku LIKE 'BULK-%'`
		);
		expect(transactions[0].n).toBe(1);
		const [sample] = await sql(`SELECT price_cents, status FROM part WHERE sku = 'BULK-00013'`);
		// Row 13: price 10 + 13 = 23, cents 13; 13 % 13 = 0 → out of stock.
		expect(sample).toEqual({ price_cents: 2313, status: 'out_of_stock' });

		// The same file again in create mode: every SKU is now in the catalogue.
		const again = await importCsv(
			merch,
			'preview',
			'create',
			csvOf([header, ...rows.slice(0, 50)])
		);
		expect(again.body.preview.errorCount).toBe(50);
	}, 120_000);

	test('update by SKU: only the mapped columns change, an empty cell keeps its value, unknown SKUs need every column', async () => {
		const before = (await sql(
			`SELECT sku, name, price_cents, version FROM part WHERE sku IN ('BULK-00001', 'BULK-00002') ORDER BY sku`
		)) as { sku: string; name: string; price_cents: number; version: number }[];
		expect(before).toHaveLength(2);
		const csv = csvOf([
			['sku', 'price'],
			['BULK-00001', '99.99'],
			['BULK-00002', '']
		]);
		const preview = (await importCsv(merch, 'preview', 'update', csv)).body.preview;
		expect(preview).toMatchObject({ updates: 1, creates: 0, errorCount: 0 });
		const committed = await importCsv(merch, 'commit', 'update', csv);
		expect(committed.body.result).toMatchObject({ updated: 1, unchanged: 1, created: 0 });
		const after = await sql(
			`SELECT sku, name, price_cents, version FROM part WHERE sku IN ('BULK-00001', 'BULK-00002') ORDER BY sku`
		);
		expect(after).toEqual([
			{ ...before[0], price_cents: 9999, version: before[0].version + 1 },
			{ ...before[1] }
		]);
		const unknown = (
			await importCsv(
				merch,
				'preview',
				'update',
				csvOf([
					['sku', 'price'],
					['TEST-NOT-THERE', '1.00']
				])
			)
		).body.preview;
		expect(unknown.errors[0]).toMatchObject({ row: 2 });
		expect(unknown.errors[0].message).toMatch(/isn’t in the catalogue/);
	});

	test('a CSV body with ?action=preview works for tools', async () => {
		const response = await merch.request('/api/parts/import?action=preview&mode=update', {
			method: 'POST',
			headers: { 'content-type': 'text/csv' },
			body: 'sku,price\r\nBULK-00003,1.00\r\n'
		});
		expect(response.status).toBe(200);
		expect((await response.json()).preview).toMatchObject({ rowCount: 1, updates: 1 });
	});

	test('only the merch team and the producer import', async () => {
		const answer = await importCsv(host, 'preview', 'create', 'sku\r\nX\r\n');
		expect(answer.status).toBe(403);
	});
});

describe('CSV export', () => {
	test('RFC 4180 CSV of the whole catalogue that reads back the same, and re-imports as “unchanged”', async () => {
		const response = await host.request('/api/parts/export');
		expect(response.status).toBe(200);
		expect(response.headers.get('content-type')).toMatch(/^text\/csv/);
		expect(response.headers.get('content-disposition')).toMatch(
			/^attachment; filename="parts-\d{4}-\d{2}-\d{2}\.csv"$/
		);
		const text = await response.text();
		// RFC 4180 §2: records end in CRLF.
		expect(text.split('\r\n')[0]).toBe(
			'sku,name,category,brand,price,currency,store_url,fitment_note,status'
		);
		const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
		expect(parsed.errors).toEqual([]);
		expect(parsed.data.length).toBe(await catalogueCount());
		const tapered = parsed.data.find((row) => row.sku === 'KBS-LB-300T')!;
		expect(tapered).toMatchObject({
			name: '3 in tapered lift block pair, 2°',
			price: '119.00',
			status: 'active'
		});

		const demoOnly = Papa.unparse(
			{
				fields: parsed.meta.fields!,
				data: parsed.data.filter((row) => !row.sku.startsWith('BULK-'))
			},
			{ newline: '\r\n' }
		);
		const preview = (await importCsv(merch, 'preview', 'update', demoOnly)).body.preview;
		expect(preview).toMatchObject({ errorCount: 0, updates: 0, creates: 0 });
	});

	test('a cell a spreadsheet would run as a formula is exported with a guard apostrophe and re-imports unchanged (OWASP CSV Injection)', async () => {
		const note = '+2 in of lift needs longer brake lines; =check bump-stop gap';
		const [{ fitment_note: before }] = await sql(
			`SELECT fitment_note FROM part WHERE sku = 'KBS-LB-300T'`
		);
		await sql(`UPDATE part SET fitment_note = $1 WHERE sku = 'KBS-LB-300T'`, [note]);
		try {
			const text = await (await host.request('/api/parts/export')).text();
			const parsed = Papa.parse<Record<string, string>>(text, {
				header: true,
				skipEmptyLines: true
			});
			expect(parsed.data.find((row) => row.sku === 'KBS-LB-300T')!.fitment_note).toBe(`'${note}`);
			const demoOnly = Papa.unparse(
				{
					fields: parsed.meta.fields!,
					data: parsed.data.filter((row) => !row.sku.startsWith('BULK-'))
				},
				{ newline: '\r\n' }
			);
			const preview = (await importCsv(merch, 'preview', 'update', demoOnly)).body.preview;
			expect(preview).toMatchObject({ errorCount: 0, updates: 0, creates: 0 });
		} finally {
			await sql(`UPDATE part SET fitment_note = $1 WHERE sku = 'KBS-LB-300T'`, [before]);
		}
	});
});
