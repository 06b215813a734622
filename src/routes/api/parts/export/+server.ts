import { api } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { exportPartsCsv } from '$lib/server/merch/parts-csv';
import type { RequestHandler } from './$types';
import { attachment } from '$lib/server/http/attachment';

/** Any crew member downloads the catalogue as CSV (the same columns the import reads). */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const body = await exportPartsCsv(channel.id);
	const date = new Date().toISOString().slice(0, 10);
	return attachment(body, {
		contentType: 'text/csv; charset=utf-8',
		filename: `parts-${date}.csv`
	});
});
