/** Tables for the edit (chapters and the timeline). */
import type { ColumnType, Generated, Selectable } from 'kysely';

type CreatedAt = ColumnType<Date, Date | string | undefined, never>;

/** A chapter marker: starts at a frame of the cut, runs to the next chapter's start or the cut's end. */
export interface ChapterTable {
	id: Generated<string>;
	episodeId: string;
	startFrame: number;
	title: string;
	url: string | null;
	/** A featured part this chapter links to; no foreign key until the parts link lands. */
	partId: string | null;
	version: Generated<number>;
	createdAt: CreatedAt;
}

export interface EditTables {
	chapter: ChapterTable;
}

export type ChapterRow = Selectable<ChapterTable>;
