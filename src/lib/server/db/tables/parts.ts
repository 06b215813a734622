/** Tables for the parts work: segment notes and their featured parts, tracked links and their clicks per day. */
import type { ColumnType, Generated, Selectable } from 'kysely';

type CreatedAt = ColumnType<Date, Date | string | undefined, never>;
type UpdatedAt = ColumnType<Date, Date | string | undefined, Date | string>;

/** A timestamped note: a moment of the episode, what is on screen, and where it came from. */
export interface SegmentNoteTable {
	id: Generated<string>;
	episodeId: string;
	segmentId: string | null;
	/** Frame of the cut at the episode's rate; null until the editor places it. */
	programFrame: number | null;
	/** The take the moment was logged against, if any. */
	takeId: string | null;
	/** Frame of the take's camera timecode at the episode's rate. */
	sourceFrame: number | null;
	text: string;
	authorId: string | null;
	version: Generated<number>;
	createdAt: CreatedAt;
	updatedAt: UpdatedAt;
}

/** A catalogue part shown at a note's moment (many per note). */
export interface SegmentNotePartTable {
	noteId: string;
	partId: string;
	createdAt: CreatedAt;
}

/** The short link /go/[code] for one part in one episode's publish kit. */
export interface TrackedLinkTable {
	id: Generated<string>;
	code: string;
	episodeId: string;
	partId: string;
	createdAt: CreatedAt;
}

/** Clicks on one tracked link on one UTC day: a count and nothing about who clicked. */
export interface LinkClickDayTable {
	linkId: string;
	/** 'YYYY-MM-DD' (the DATE parser keeps it as text). */
	day: string;
	clicks: Generated<number>;
}

export interface PartsTables {
	segmentNote: SegmentNoteTable;
	segmentNotePart: SegmentNotePartTable;
	trackedLink: TrackedLinkTable;
	linkClickDay: LinkClickDayTable;
}

export type SegmentNoteRow = Selectable<SegmentNoteTable>;
export type TrackedLinkRow = Selectable<TrackedLinkTable>;
