/** Reads a part form into the shape partCreateSchema / partUpdateSchema take. */
export function partFormValues(form: FormData) {
	const text = (name: string) => String(form.get(name) ?? '');
	return {
		sku: text('sku'),
		name: text('name'),
		category: text('category'),
		brand: text('brand'),
		price: text('price'),
		currency: text('currency'),
		storeUrl: text('storeUrl'),
		fitmentNote: text('fitmentNote'),
		status: text('status')
	};
}
