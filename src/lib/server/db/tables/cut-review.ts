/** Tables for the cut review: versions of the cut and comments on them (migrations/2026-12-04-10-cut-review). */
import type { ColumnType, Generated } from 'kysely';
import type { CutApproval, CutCommentState } from '$lib/cut-review';

type CreatedAt = ColumnType<Date, Date | string | undefined, never>;

/** One cut upload as a numbered version of the episode's cut. */
export interface CutVersionTable {
	id: Generated<string>;
	episodeId: string;
	footageId: string;
	/** 1, 2, … per episode, in upload order. */
	number: number;
	changeNote: Generated<string>;
	approval: ColumnType<CutApproval, CutApproval | undefined, CutApproval>;
	approvalNote: string | null;
	approvedBy: string | null;
	approvedAt: Date | null;
	/** The shift (frames) the editor confirmed for the comments carried into this version. */
	carryOffsetFrames: Generated<number>;
	version: Generated<number>;
	createdAt: CreatedAt;
}

/** A comment at a frame of a version (or over a range, end exclusive). */
export interface CutCommentTable {
	id: Generated<string>;
	episodeId: string;
	cutVersionId: string;
	startFrame: number;
	endFrame: number | null;
	body: string;
	authorId: string | null;
	state: ColumnType<CutCommentState, CutCommentState | undefined, CutCommentState>;
	stateReason: string | null;
	stateBy: string | null;
	stateAt: Date | null;
	/** The number of the version it was carried from last; null for a comment made on this one. */
	carriedFrom: number | null;
	sourceStartFrame: number | null;
	sourceEndFrame: number | null;
	version: Generated<number>;
	createdAt: CreatedAt;
}

export interface CutCommentReplyTable {
	id: Generated<string>;
	commentId: string;
	authorId: string | null;
	body: string;
	createdAt: CreatedAt;
}

export interface CutReviewTables {
	cutVersion: CutVersionTable;
	cutComment: CutCommentTable;
	cutCommentReply: CutCommentReplyTable;
}
