/**
 * Constants of the parts pages (statuses, sorts, limits, the import's columns), without Zod: a page
 * imports these, so the browser is not sent the schema library for a list or a label ("JavaScript
 * budget", DEVELOPERS.md). `./parts` re-exports them for the server.
 */

export const PART_STATUSES = ['active', 'discontinued', 'out_of_stock'] as const;
export type PartStatusValue = (typeof PART_STATUSES)[number];
export const PART_STATUS_LABELS: Record<PartStatusValue, string> = {
	active: 'Active',
	discontinued: 'Discontinued',
	out_of_stock: 'Out of stock'
};

export const PART_SORTS = ['sku', 'name', 'brand', 'category', 'price', 'status'] as const;
export type PartSort = (typeof PART_SORTS)[number];

export const PART_PAGE_SIZES = [10, 25, 50, 100] as const;
export const MAX_PART_PAGE_SIZE = 100;

/** Limits of our own, generous for real catalogues and small enough to keep a table readable. */
export const PART_LIMITS = {
	sku: 64,
	name: 200,
	category: 80,
	brand: 80,
	storeUrl: 2000,
	fitmentNote: 1000
} as const;
/** Highest price accepted: 10,000,000.00, far above any part and well inside a 32-bit cent count. */
export const MAX_PRICE_CENTS = 1_000_000_000;

/** Wrenchroll's catalogue columns a CSV file's columns are mapped onto, in the order the export writes them. */
export const IMPORT_FIELDS = [
	'sku',
	'name',
	'category',
	'brand',
	'price',
	'currency',
	'storeUrl',
	'fitmentNote',
	'status'
] as const;
export type ImportField = (typeof IMPORT_FIELDS)[number];
export const IMPORT_FIELD_LABELS: Record<ImportField, string> = {
	sku: 'SKU (part number)',
	name: 'Name',
	category: 'Category',
	brand: 'Brand',
	price: 'Price',
	currency: 'Currency',
	storeUrl: 'Store URL',
	fitmentNote: 'Fitment note',
	status: 'Status'
};
/** Needed for every new part; in update mode only the SKU is needed for parts already in the catalogue. */
export const REQUIRED_IMPORT_FIELDS: readonly ImportField[] = [
	'sku',
	'name',
	'category',
	'brand',
	'price',
	'storeUrl'
];

export type ImportMapping = Partial<Record<ImportField, string | null>>;
