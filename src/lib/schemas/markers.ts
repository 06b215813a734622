/**
 * Shapes of the marker exports and the chapter import from an edit system's file: shared by the
 * API route and the edit page's client. The file's rows are checked by $lib/edit/edl.ts and
 * otio.ts, which name each bad row; only the request's shape is checked here.
 */
import { z } from 'zod';
import { MARKER_FILE_LIMIT_BYTES } from '$lib/edit/markers';
import { text as storableText } from './fields';

export const MARKER_FORMATS = ['edl', 'otio'] as const;
export type MarkerFormat = (typeof MARKER_FORMATS)[number];

export const markerFormatSchema = z.enum(MARKER_FORMATS, {
	error: 'Pick the file’s format: edl (CMX 3600) or otio (OpenTimelineIO).'
});

const limitInKilobytes = MARKER_FILE_LIMIT_BYTES / 1024;

export const markerImportSchema = z
	.object({
		fileName: storableText('The file name is text.')
			.max(255, 'That file name is too long; rename the file and upload it again.')
			.optional(),
		text: storableText('Choose the EDL or OpenTimelineIO file exported from the edit system.')
			.min(1, 'That file is empty. Export the markers from the edit system again.')
			// Characters, not bytes: the browser checks the bytes first; this bounds what the server reads.
			.max(
				MARKER_FILE_LIMIT_BYTES,
				`That file is larger than ${limitInKilobytes} KB; a marker list is far smaller. Check you picked the EDL or OpenTimelineIO file.`
			),
		format: markerFormatSchema.optional(),
		/** Absent or false: only show what would change. True: write it. */
		confirm: z.boolean({ error: 'confirm is true or false.' }).optional(),
		/** The chapter list's fingerprint the preview was made from; a confirm needs it. */
		basis: storableText('basis comes from the preview.')
			.max(40, 'basis comes from the preview.')
			.optional()
	})
	.strict()
	.refine((input) => !input.confirm || input.basis !== undefined, {
		path: ['basis'],
		message: 'Look at the preview first, then confirm it.'
	});

export type MarkerImport = z.infer<typeof markerImportSchema>;
