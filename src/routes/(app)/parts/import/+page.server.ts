import { fail } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { DomainError } from '$lib/server/http/api';
import { parseForm } from '$lib/server/http/forms';
import { commitPartImport } from '$lib/server/merch/parts-import';
import { previewPartImport, type ImportPreview } from '$lib/server/merch/parts-import-preview';
import { importRequestSchema } from '$lib/schemas/parts';
import type { Actions, PageServerLoad } from './$types';

type Errors = Record<'form' | 'file', string[] | undefined>;
const errors = (found: Partial<Errors>): Errors => ({ form: undefined, file: undefined, ...found });

/**
 * The CSV import: the merch team and the producer only. With JavaScript the page reads the file in
 * the browser and talks to /api/parts/import (live column mapping). Without it, these actions do
 * the same: `check` previews an uploaded file (columns guessed from the headers), `commit` imports
 * the text the check handed back, all rows in one transaction or none.
 */
export const load = (async (event) => {
	requireRole(event, 'merch', 'producer');
	return {};
}) satisfies PageServerLoad;

const NO_FILE = 'Pick a CSV file first: the catalogue’s own export is a good template.';

/** The file's text and the chosen mode, checked with the same schema the API uses. */
async function readRequest(form: FormData, action: 'preview' | 'commit') {
	const file = form.get('file');
	const csv =
		file instanceof File && file.size > 0 ? await file.text() : String(form.get('csv') ?? '');
	const fileName =
		file instanceof File && file.size > 0 ? file.name : String(form.get('fileName') ?? '');
	const mode = String(form.get('mode') ?? 'create');
	if (csv.trim() === '')
		return {
			ok: false as const,
			failure: fail(400, { errors: errors({ file: [NO_FILE] }), mode, fileName })
		};
	const parsed = parseForm(importRequestSchema, { action, mode, csv });
	if (!parsed.ok)
		return {
			ok: false as const,
			failure: fail(400, {
				errors: errors({ file: Object.values(parsed.errors).flat() }),
				mode,
				fileName
			})
		};
	return { ok: true as const, request: parsed.data, fileName };
}

export const actions = {
	check: async (event) => {
		const { channel } = requireRole(event, 'merch', 'producer');
		const read = await readRequest(await event.request.formData(), 'preview');
		if (!read.ok) return read.failure;
		const preview = await previewPartImport(channel.id, read.request);
		return { preview, csv: read.request.csv, mode: read.request.mode, fileName: read.fileName };
	},
	commit: async (event) => {
		const { channel } = requireRole(event, 'merch', 'producer');
		const read = await readRequest(await event.request.formData(), 'commit');
		if (!read.ok) return read.failure;
		try {
			const result = await commitPartImport(channel.id, read.request);
			return { result, mode: read.request.mode, fileName: read.fileName };
		} catch (failure) {
			if (!(failure instanceof DomainError)) throw failure;
			// A refused import writes nothing and shows why, with the rows at fault when there are some.
			const preview = (failure.extra?.preview as ImportPreview | undefined) ?? null;
			return fail(failure.status, {
				errors: errors({ form: [failure.message] }),
				preview,
				csv: read.request.csv,
				mode: read.request.mode,
				fileName: read.fileName
			});
		}
	}
} satisfies Actions;
