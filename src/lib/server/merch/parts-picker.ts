/** A compact list of catalogue parts for pickers (the full catalogue search comes with the parts work). */
import { db } from '../db';

export async function searchPartsForPicker(channelId: string, limit = 500) {
	return db
		.selectFrom('part')
		.select(['id', 'sku', 'name', 'status'])
		.where('channelId', '=', channelId)
		.orderBy('category')
		.orderBy('sku')
		.limit(limit)
		.execute();
}
