/** Tables for episode work (rundown segments, scripts, stage history, cautions, shots and takes, script reviews). */
import type { ColumnType, Generated } from 'kysely';
import type { HazardId } from '$lib/cautions';
import type { SegmentKind } from '$lib/rundown';
import type { Stage } from '$lib/stages';

type CreatedAt = ColumnType<Date, Date | string | undefined, never>;
type UpdatedAt = ColumnType<Date, Date | string | undefined, Date | string>;

export interface SegmentTable {
	id: Generated<string>;
	episodeId: string;
	position: number;
	kind: SegmentKind;
	title: string;
	plannedSeconds: Generated<number>;
	buildId: string | null;
	needsFootage: Generated<boolean>;
	hazards: ColumnType<HazardId[], HazardId[] | undefined, HazardId[]>;
	/** Length of the segment in the cut (episode frame rate), set by the editor. */
	recordedFrames: number | null;
	/** In and out points of the segment on the edit timeline (programme frames, out exclusive); null until placed. */
	cutInFrame: number | null;
	cutOutFrame: number | null;
	promiseEpisodeId: string | null;
	promiseTitle: string | null;
	version: Generated<number>;
	createdAt: CreatedAt;
	updatedAt: UpdatedAt;
}

export interface SegmentScriptTable {
	segmentId: string;
	body: Generated<string>;
	version: Generated<number>;
	updatedBy: string | null;
	updatedAt: UpdatedAt;
}

export interface CautionTable {
	id: Generated<string>;
	segmentId: string;
	hazard: HazardId;
	text: string;
	/** Frame in the cut where the caution card appears; null until the editor places it. */
	atFrame: number | null;
	/** How long the card stays on screen, in frames at the episode's rate; null until set. */
	durationFrames: number | null;
	version: Generated<number>;
	createdAt: CreatedAt;
	updatedAt: UpdatedAt;
}

export type Roll = 'A' | 'B';

export interface ShotTable {
	id: Generated<string>;
	segmentId: string;
	what: string;
	angle: Generated<string>;
	roll: ColumnType<Roll, Roll | undefined, Roll>;
	camera: Generated<string>;
	notes: Generated<string>;
	position: number;
	version: Generated<number>;
	createdAt: CreatedAt;
}

export interface TakeTable {
	id: Generated<string>;
	shotId: string;
	clipName: string;
	sourceInFrames: number;
	sourceOutFrames: number;
	good: Generated<boolean>;
	note: Generated<string>;
	/** The uploaded footage; no foreign key until the shoot work adds the footage table. */
	footageId: string | null;
	/** The source timecode was typed drop-frame (';'); frames are the same either way. */
	sourceDropFrame: Generated<boolean>;
	version: Generated<number>;
	createdAt: CreatedAt;
}

export interface StageMoveTable {
	id: Generated<string>;
	episodeId: string;
	personId: string | null;
	fromStage: Stage | null;
	toStage: Stage;
	note: Generated<string>;
	createdAt: CreatedAt;
}

export type ScriptReviewKind = 'submitted' | 'approved' | 'returned' | 'comment';

export interface ScriptReviewTable {
	id: Generated<string>;
	episodeId: string;
	segmentId: string | null;
	personId: string | null;
	kind: ScriptReviewKind;
	body: Generated<string>;
	fingerprint: string | null;
	createdAt: CreatedAt;
}

export interface EpisodeWorkTables {
	segment: SegmentTable;
	segmentScript: SegmentScriptTable;
	caution: CautionTable;
	shot: ShotTable;
	take: TakeTable;
	stageMove: StageMoveTable;
	scriptReview: ScriptReviewTable;
}
