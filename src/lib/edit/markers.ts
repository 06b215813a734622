/**
 * Markers for an edit system: the episode's chapters, caution cards, spec cards (and later review
 * comments) as one generic list, written to and read from open interchange files (edl.ts, otio.ts).
 * Pure module: no I/O, safe in the browser and on the server.
 */

export const MARKER_KINDS = ['chapter', 'caution', 'spec', 'comment'] as const;
export type MarkerKind = (typeof MARKER_KINDS)[number];

/** One marker on the cut: a frame count from its first frame (frame 0), never a label. */
export interface Marker {
	frame: number;
	/** How long it covers (0 for a point); a chapter runs to the next one, a card for its time on screen. */
	durationFrames: number;
	kind: MarkerKind;
	name: string;
	note: string;
}

/** The word a marker's kind is written as in a file (and read back from). */
export const MARKER_KIND_WORDS: Record<MarkerKind, string> = {
	chapter: 'CHAPTER',
	caution: 'CAUTION',
	spec: 'SPEC',
	comment: 'COMMENT'
};

/** The kind a written word names, or null for any other word (another system's own label). */
export function kindOfWord(word: string): MarkerKind | null {
	const upper = word.trim().toUpperCase();
	const found = MARKER_KINDS.find((kind) => MARKER_KIND_WORDS[kind] === upper);
	return found ?? null;
}

/** A marker read from a file: where it was (EDL line or OTIO item path), its frame, kind and name. */
export interface ReadMarker {
	where: string;
	frame: number;
	/** Null when the file names no kind of ours: another system's marker, read as a chapter. */
	kind: MarkerKind | null;
	name: string;
}

/** A problem with one row of a file, in plain words, with where it is. */
export interface RowError {
	where: string;
	message: string;
}

export interface MarkerRead {
	markers: ReadMarker[];
	errors: RowError[];
}

/** Markers in frame order; at one frame, chapters first, then cautions, spec cards, comments. */
export function inMarkerOrder(markers: readonly Marker[]): Marker[] {
	const rank = (kind: MarkerKind) => MARKER_KINDS.indexOf(kind);
	return [...markers].sort((a, b) => a.frame - b.frame || rank(a.kind) - rank(b.kind));
}

/**
 * Text kept to one line without control characters, as a comment line or a marker name needs;
 * half of a UTF-16 pair (a broken emoji) becomes U+FFFD, since it can't be stored as UTF-8.
 */
export function oneLine(text: string): string {
	return text
		.replace(/[\u0000-\u001f\u007f-\u009f]+/g, ' ')
		.replace(/[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/g, '\uFFFD')
		.replace(/\s+/g, ' ')
		.trim();
}

/** The largest marker file the edit page takes: a marker list is a few kilobytes. */
export const MARKER_FILE_LIMIT_BYTES = 512 * 1024;

/** The longest marker name a chapter import accepts (the chapter title's hard limit). */
export const IMPORTED_NAME_LIMIT = 500;
