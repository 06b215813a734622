/** Tables for the shoot: shoot days, recording profiles, gear, pull list, uploads and footage. */
import type { ColumnType, Generated } from 'kysely';
import type { FrameRate } from '$lib/timecode';

type CreatedAt = ColumnType<Date, Date | string | undefined, never>;
type Numeric = ColumnType<number, number | undefined, number>;

export interface RecordingProfileTable {
	id: Generated<string>;
	channelId: string;
	name: string;
	camera: string;
	codec: string;
	resolution: string;
	/** One of FRAME_RATES; the recording_profile_frame_rate_known check refuses anything else. */
	frameRate: FrameRate;
	bitrateMbps: number;
	version: Generated<number>;
	createdAt: CreatedAt;
}

export interface ShootDayTable {
	id: Generated<string>;
	channelId: string;
	episodeId: string;
	shootDate: string;
	locationName: string;
	locationAddress: Generated<string>;
	bay: Generated<string>;
	bayFrom: string | null;
	bayUntil: string | null;
	callTime: string;
	wrapTime: string;
	programMinutes: Numeric;
	shootingRatio: Numeric;
	cardSizeGb: Numeric;
	uplinkMbps: Numeric;
	notes: Generated<string>;
	version: Generated<number>;
	createdAt: CreatedAt;
}

export interface ShootDayCrewTable {
	shootDayId: string;
	personId: string;
	duty: Generated<string>;
}

export interface ShootDayBuildTable {
	shootDayId: string;
	buildId: string;
}

export interface ShootDayCameraTable {
	id: Generated<string>;
	shootDayId: string;
	label: string;
	profileId: string;
	rollHours: number | null;
}

export type GearKind = 'camera' | 'audio' | 'light' | 'grip' | 'other';

export interface GearItemTable {
	id: Generated<string>;
	shootDayId: string;
	kind: GearKind;
	label: string;
	quantity: Generated<number>;
}

export interface PullItemTable {
	id: Generated<string>;
	shootDayId: string;
	partId: string | null;
	label: string;
	quantity: Generated<number>;
	source: ColumnType<'segment' | 'extra', 'segment' | 'extra' | undefined, 'segment' | 'extra'>;
	onHand: Generated<boolean>;
	checkedBy: string | null;
	checkedAt: Date | null;
	version: Generated<number>;
}

export type UploadPurpose = 'footage' | 'cut';

export interface UploadTable {
	id: string;
	channelId: string;
	personId: string;
	episodeId: string;
	shootDayId: string | null;
	purpose: UploadPurpose;
	cameraLabel: Generated<string>;
	clipName: string;
	fileName: string;
	fileType: string;
	/** Null until known for an upload created with tus Upload-Defer-Length. */
	sizeBytes: number | null;
	/** The editor's change note for a cut upload ('' for footage); it moves to the cut version. */
	changeNote: Generated<string>;
	createdAt: CreatedAt;
	completedAt: Date | null;
}

export interface FootageTable {
	id: Generated<string>;
	channelId: string;
	episodeId: string;
	shootDayId: string | null;
	uploadId: string;
	purpose: UploadPurpose;
	cameraLabel: Generated<string>;
	clipName: string;
	fileName: string;
	fileType: string;
	sizeBytes: number;
	sha256: string;
	durationSeconds: number | null;
	/**
	 * The rate ffprobe measured, as a decimal label ("29.97", "120"): a fact about the file, not a
	 * programme rate, so not a FrameRate. Null when nothing was read.
	 */
	frameRate: string | null;
	videoCodec: string | null;
	probeNote: string | null;
	/** The rest of the probe (2026-12-03-50): null where ffprobe read nothing. */
	videoProfile: string | null;
	pixelFormat: string | null;
	variableFrameRate: boolean | null;
	width: number | null;
	height: number | null;
	/** The start timecode the camera wrote (container tag or timecode track), as written. */
	startTimecode: string | null;
	audioChannels: number | null;
	bitRate: number | null;
	/** Where the file and what is made from it live (2026-12-04-10): the upload folder or the bucket. */
	storedIn: Generated<'disk' | 'bucket'>;
	uploadedBy: string | null;
	createdAt: CreatedAt;
}

export interface ShootDaySegmentTable {
	shootDayId: string;
	segmentId: string;
}

export interface ShootTables {
	shootDaySegment: ShootDaySegmentTable;
	recordingProfile: RecordingProfileTable;
	shootDay: ShootDayTable;
	shootDayCrew: ShootDayCrewTable;
	shootDayBuild: ShootDayBuildTable;
	shootDayCamera: ShootDayCameraTable;
	gearItem: GearItemTable;
	pullItem: PullItemTable;
	upload: UploadTable;
	footage: FootageTable;
}
