/** The Database interface: one entry per table, camelCase (CamelCasePlugin maps snake_case columns). */
import type { ColumnType, Generated, Insertable, Selectable, Updateable } from 'kysely';

import type { Role } from '$lib/roles';
import type { Stage } from '$lib/stages';
import type { SuspensionType } from '$lib/specs/lift';
import type { FrameRate } from '$lib/timecode';
import type { EpisodeWorkTables } from './tables/episode-work';
import type { EditTables } from './tables/edit';
import type { ShootTables } from './tables/shoot';
import type { PartsTables } from './tables/parts';
import type { SpecCardTables } from './tables/spec-cards';
import type { MediaTables } from './tables/media';
import type { SpeakingPaceTables } from './tables/speaking-pace';
import type { CutReviewTables } from './tables/cut-review';
export type { Role } from '$lib/roles';
export type { Stage } from '$lib/stages';

type CreatedAt = ColumnType<Date, Date | string | undefined, never>;
type Timestamp = ColumnType<Date, Date | string, Date | string>;

export interface ChannelTable {
	id: Generated<string>;
	name: string;
	/** One of FRAME_RATES; the channel_frame_rate_known check refuses anything else. */
	frameRate: ColumnType<FrameRate, FrameRate | undefined, FrameRate>;
	callToAction: Generated<string>;
	contact: Generated<string>;
	/** Said beside the tracked links in every publish kit; '' until the producer writes it. */
	disclosure: Generated<string>;
	descriptionLimit: Generated<number>;
	/** Whole decimal gigabytes that finished footage and unfinished uploads may take. */
	storageQuotaGb: Generated<number>;
	version: Generated<number>;
	createdAt: CreatedAt;
}

export interface PersonTable {
	id: Generated<string>;
	email: string;
	name: string;
	passwordHash: string | null;
	/** The channel last chosen: a browser without a channel cookie (a new sign-in) opens it. */
	lastChannelId: string | null;
	createdAt: CreatedAt;
}

export interface MembershipTable {
	channelId: string;
	personId: string;
	roles: ColumnType<Role[], Role[] | undefined, Role[]>;
	disabledAt: Timestamp | null;
	invitedBy: string | null;
	createdAt: CreatedAt;
}

export interface PersonSessionTable {
	id: Generated<string>;
	personId: string;
	createdAt: CreatedAt;
	expiresAt: Timestamp;
}

export interface OneTimeLinkTable {
	id: Generated<string>;
	personId: string;
	channelId: string | null;
	/** 'unlock': a mailed link that lets its owner's browser sign in past the throttle (see auth/unlock.ts). */
	purpose: 'invite' | 'reset' | 'unlock';
	tokenHash: string;
	expiresAt: Timestamp;
	usedAt: Timestamp | null;
	createdAt: CreatedAt;
}

export interface ApiTokenTable {
	id: Generated<string>;
	personId: string;
	channelId: string;
	label: string;
	tokenHash: string;
	tokenHint: string;
	createdAt: CreatedAt;
	lastUsedAt: Timestamp | null;
	revokedAt: Timestamp | null;
}

/** One throttle key's attempts in its current fixed window (see auth/throttle.ts). */
export interface ThrottleCounterTable {
	key: string;
	hits: number;
	windowEndsAt: Timestamp;
}

export interface OutboxTable {
	id: Generated<string>;
	channelId: string | null;
	toAddress: string;
	subject: string;
	bodyText: string;
	attempts: Generated<number>;
	nextAttemptAt: ColumnType<Date, Date | string | undefined, Date | string>;
	lastError: string | null;
	sentAt: Timestamp | null;
	/** While set and in the future, a sender is working on the row; after it, anyone may claim it again. */
	claimedUntil: Timestamp | null;
	createdAt: CreatedAt;
}

export interface BuildTable {
	id: Generated<string>;
	channelId: string;
	name: string;
	year: number;
	vehicleType: string;
	drivetrain: string;
	frontSuspension: string;
	rearSuspension: string;
	frontLiftIn: ColumnType<number, number | undefined, number>;
	rearLiftIn: ColumnType<number, number | undefined, number>;
	tyreSize: string;
	notes: Generated<string>;
	/** Spring type per axle (for the lift notes on the build sheet); null until someone sets it. */
	frontSpring: SuspensionType | null;
	rearSpring: SuspensionType | null;
	/** How each axle is lifted, one of LIFT_METHODS in $lib/specs/lift; null for none or unknown. */
	frontLiftMethod: string | null;
	rearLiftMethod: string | null;
	version: Generated<number>;
	createdAt: CreatedAt;
}

export type PartStatus = 'active' | 'discontinued' | 'out_of_stock';

export interface PartTable {
	id: Generated<string>;
	channelId: string;
	sku: string;
	name: string;
	category: string;
	brand: string;
	priceCents: number;
	currency: Generated<string>;
	storeUrl: string;
	fitmentNote: Generated<string>;
	status: ColumnType<PartStatus, PartStatus | undefined, PartStatus>;
	version: Generated<number>;
	createdAt: CreatedAt;
}

export type ScriptStatus = 'draft' | 'submitted' | 'approved' | 'returned';

export interface EpisodeTable {
	id: Generated<string>;
	channelId: string;
	title: string;
	slug: string;
	logline: Generated<string>;
	targetRuntimeSeconds: number;
	/** One of FRAME_RATES; the episode_frame_rate_known check refuses anything else. */
	frameRate: FrameRate;
	publishDate: ColumnType<string | null, string | null | undefined, string | null>;
	stage: ColumnType<Stage, Stage | undefined, Stage>;
	cutDurationFrames: number | null;
	/** Programme timecode form: null is the rate's usual one (drop-frame at 29.97 and 59.94). */
	timecodeDropFrame: boolean | null;
	/** The cut's first frame's label, `HH:MM:SS:FF` (episode_timecode_start check). */
	timecodeStart: Generated<string>;
	scriptStatus: ColumnType<ScriptStatus, ScriptStatus | undefined, ScriptStatus>;
	/**
	 * Fingerprint of the script as saved now (episodes/fingerprint.ts), kept by the database's own
	 * triggers on segment and segment_script (migrations/2026-12-04-30-stored-script-fingerprint.ts):
	 * never written by the app.
	 */
	scriptFingerprint: ColumnType<string, never, never>;
	/** Fingerprint of the script text as approved; a later edit makes it differ from the current one. */
	scriptApprovedFingerprint: string | null;
	scriptApprovedAt: Timestamp | null;
	scriptApprovedBy: string | null;
	version: Generated<number>;
	createdAt: CreatedAt;
}

export interface EpisodeBuildTable {
	episodeId: string;
	buildId: string;
}

export interface EpisodeAssignmentTable {
	episodeId: string;
	role: Role;
	personId: string;
}

export interface Database
	extends
		EpisodeWorkTables,
		EditTables,
		ShootTables,
		PartsTables,
		SpecCardTables,
		SpeakingPaceTables,
		MediaTables,
		CutReviewTables {
	build: BuildTable;
	part: PartTable;
	episode: EpisodeTable;
	episodeBuild: EpisodeBuildTable;
	episodeAssignment: EpisodeAssignmentTable;
	channel: ChannelTable;
	person: PersonTable;
	membership: MembershipTable;
	personSession: PersonSessionTable;
	oneTimeLink: OneTimeLinkTable;
	apiToken: ApiTokenTable;
	throttleCounter: ThrottleCounterTable;
	outbox: OutboxTable;
}

export type Channel = Selectable<ChannelTable>;
export type Person = Selectable<PersonTable>;
export type NewPerson = Insertable<PersonTable>;
export type Membership = Selectable<MembershipTable>;
export type ChannelUpdate = Updateable<ChannelTable>;
export type OutboxMessage = Selectable<OutboxTable>;
