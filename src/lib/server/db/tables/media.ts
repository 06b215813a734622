/** What the media worker makes from each finished upload (see migrations/2026-12-03-50-media-outputs). */
import type { ColumnType } from 'kysely';
import type { MediaKind, MediaState } from '$lib/media';

export interface MediaOutputTable {
	footageId: string;
	kind: MediaKind;
	state: ColumnType<MediaState, MediaState | undefined, MediaState>;
	/** 0–1 while working; 1 when done. */
	progress: ColumnType<number, number | undefined, number>;
	/** The pg-boss job that makes it (the newest one). */
	jobId: string | null;
	attempts: ColumnType<number, number | undefined, number>;
	/** Where the file is: a key under the storage root (local `uploads/derived/…`). */
	storageKey: string | null;
	bytes: number | null;
	/** Kind-specific facts for the player (a sprite's grid, the peaks' rate). */
	details: ColumnType<unknown, string | undefined, string | null>;
	/** Why it failed or was skipped, in the crew's words. */
	message: string | null;
	heartbeatAt: Date | null;
	updatedAt: ColumnType<Date, Date | string | undefined, Date | string>;
}

export interface MediaTables {
	mediaOutput: MediaOutputTable;
}
