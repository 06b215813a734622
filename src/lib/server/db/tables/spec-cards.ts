/** Tables for the spec-cards work: the computed numbers an episode shows on screen. */
import type { ColumnType, Generated, Selectable } from 'kysely';
import type { SpecCardInput, SpecCardKind } from '$lib/specs/cards';

type CreatedAt = ColumnType<Date, Date | string | undefined, never>;
type UpdatedAt = ColumnType<Date, Date | string | undefined, Date | string>;

export interface SpecCardTable {
	id: Generated<string>;
	episodeId: string;
	/** The rundown segment the card belongs to; null when none (or the segment was removed). */
	segmentId: string | null;
	kind: SpecCardKind;
	/** The card as entered, checked with specCardInputSchema and renderSpecCard before it is stored. */
	input: ColumnType<SpecCardInput, string, string>;
	/** Program time in the cut where the card appears (episode frame rate); null until placed. */
	atFrame: number | null;
	/** How long it stays on screen, in frames at the episode's rate. */
	durationFrames: number | null;
	/** Order of creation within the episode; breaks ties between cards at the same frame. */
	position: number;
	version: Generated<number>;
	createdBy: string | null;
	createdAt: CreatedAt;
	updatedAt: UpdatedAt;
}

export interface SpecCardTables {
	specCard: SpecCardTable;
}

export type SpecCardRow = Selectable<SpecCardTable>;
