/**
 * The production line an episode travels along: script → shoot → edit → locked → published.
 * Pure; shared by the pages (the line visual, the move buttons) and the server (who may move).
 *
 * Who may move an episode (our own rule, kept short so the crew can predict it):
 * - A producer moves it one stage forward (after the gate checks pass) or back to any earlier stage.
 * - The person assigned to the role that works the current stage may move it one stage forward,
 *   through the same gate checks: the host from script, the camera operator from shoot, the editor
 *   from edit. Nobody but a producer moves it back, or from locked to published.
 */
import type { Role } from './roles';

export const STAGES = ['script', 'shoot', 'edit', 'locked', 'published'] as const;
export type Stage = (typeof STAGES)[number];

export const STAGE_LABELS: Record<Stage, string> = {
	script: 'Script',
	shoot: 'Shoot',
	edit: 'Edit',
	locked: 'Locked',
	published: 'Published'
};

/** What happens at each station, in the crew's words. */
export const STAGE_WORK: Record<Stage, string> = {
	script: 'Rundown and script written, then approved by the producer',
	shoot: 'Filmed in the bay against the shot list',
	edit: 'Cut, chapters marked, cautions and parts placed',
	locked: 'Picture lock: the cut is final, the publish kit is checked',
	published: 'Live on the channel'
};

/** The role that works an episode while it sits at a stage: they are mailed when it arrives. */
export const STAGE_OWNER: Record<Stage, Role | null> = {
	script: 'host',
	shoot: 'camera',
	edit: 'editor',
	locked: 'merch',
	published: null
};

/** The roles whose assignee may move an episode forward out of a stage (besides any producer). */
const FORWARD_BY_ASSIGNEE: Partial<Record<Stage, Role>> = {
	script: 'host',
	shoot: 'camera',
	edit: 'editor'
};

export function isStage(value: unknown): value is Stage {
	return typeof value === 'string' && (STAGES as readonly string[]).includes(value);
}

export function stageIndex(stage: Stage): number {
	return STAGES.indexOf(stage);
}

export function nextStage(stage: Stage): Stage | null {
	return STAGES[stageIndex(stage) + 1] ?? null;
}

export function previousStages(stage: Stage): Stage[] {
	return STAGES.slice(0, stageIndex(stage));
}

export type MoveDirection = 'forward' | 'back';

/** Forward is exactly one station on; back is any earlier station; anything else is not a move. */
export function moveDirection(from: Stage, to: Stage): MoveDirection | null {
	const step = stageIndex(to) - stageIndex(from);
	if (step === 1) return 'forward';
	if (step < 0) return 'back';
	return null;
}

export interface Mover {
	personId: string;
	/** The mover's roles in the episode's channel. */
	roles: readonly Role[];
}

/** Whether this person may make this move, by the rule in this module's header; the gate checks are separate. */
export function mayMoveStage(
	mover: Mover,
	assignments: Partial<Record<Role, string>>,
	from: Stage,
	to: Stage
): boolean {
	const direction = moveDirection(from, to);
	if (direction === null) return false;
	if (mover.roles.includes('producer')) return true;
	if (direction === 'back') return false;
	const role = FORWARD_BY_ASSIGNEE[from];
	return role !== undefined && mover.roles.includes(role) && assignments[role] === mover.personId;
}

/** Who may move an episode forward from a stage, in words for the page. */
export function forwardMoversText(stage: Stage): string {
	const role = FORWARD_BY_ASSIGNEE[stage];
	const names: Record<Role, string> = {
		producer: 'producer',
		host: 'host',
		camera: 'camera operator',
		editor: 'editor',
		merch: 'merch team'
	};
	return role ? `A producer or the assigned ${names[role]}` : 'A producer';
}

/** The kinds of work a stage can fix, one name per write path (see stageLock). */
export const LOCKABLE = [
	'rundown',
	'script',
	'shots',
	'notes',
	'chapters',
	'cards',
	'cut'
] as const;
export type Lockable = (typeof LOCKABLE)[number];

/**
 * The first stage at which each kind of work is fixed (our own rule; DEVELOPERS.md, "Stage locks",
 * gives the reasons). Picture lock fixes what the picture is made of: the cut's length, the rundown
 * (segments, their order and their lengths in the cut), the script said on camera and the shot list
 * filmed. Notes, chapters and cards stay open at picture lock because the merch team links parts and
 * the editor finishes chapters and on-screen cards against the fixed cut then. Publishing fixes
 * everything else: chapters, notes and parts are in the live description, the cards on screen.
 */
const FIXED_FROM: Record<Lockable, Stage> = {
	cut: 'locked',
	rundown: 'locked',
	script: 'locked',
	shots: 'locked',
	notes: 'published',
	chapters: 'published',
	cards: 'published'
};

/** Why each kind of work is fixed, at picture lock and once published, in the crew's words. */
const WHY: Record<Lockable, { locked: string; published: string }> = {
	cut: {
		locked:
			'The picture is locked, so the cut is final: its length, its approved version and its review.',
		published:
			'This episode is published: its chapters are in the live description and the cut is final.'
	},
	rundown: {
		locked:
			'The picture is locked, so the rundown (its segments, their order and lengths) is final.',
		published: 'This episode is published: its rundown is the video viewers watch.'
	},
	script: {
		locked: 'The picture is locked, so the script is what was said on camera.',
		published: 'This episode is published: its script is what was said on camera and approved.'
	},
	shots: {
		locked: 'The picture is locked, so the shot list is what was filmed.',
		published: 'This episode is published: its shot list is what was filmed.'
	},
	notes: {
		locked: '',
		published:
			'This episode is published: its notes and the parts linked to them are in the live description.'
	},
	chapters: {
		locked: '',
		published:
			'This episode is published: its chapters are in the live description and the cut is final.'
	},
	cards: {
		locked: '',
		published: 'This episode is published: its spec and caution cards are in the live video.'
	}
};

/** The stage a producer moves an episode back to so that this kind of work opens again. */
export function reopensAt(what: Lockable): Stage {
	return STAGES[stageIndex(FIXED_FROM[what]) - 1];
}

/**
 * Why this kind of work may not change at this stage, with how to open it again; null when it may.
 * The one rule table every write path asks (server: episodes/stage-locks.ts; pages: to disable
 * their controls).
 */
export function stageLock(stage: Stage, what: Lockable): string | null {
	if (stageIndex(stage) < stageIndex(FIXED_FROM[what])) return null;
	const why = WHY[what][stage === 'published' ? 'published' : 'locked'];
	return `${why} A producer can move it back to ${STAGE_LABELS[reopensAt(what)]} to change it.`;
}

/** Every kind of work with its lock at this stage (null: open), for a page that shows several. */
export function stageLocks(stage: Stage): Record<Lockable, string | null> {
	return Object.fromEntries(LOCKABLE.map((what) => [what, stageLock(stage, what)])) as Record<
		Lockable,
		string | null
	>;
}

/**
 * What the edit page may still change at a stage, as the reason it may not (null: it may).
 * Picture lock fixes the cut's length; publishing fixes the chapters too, because they are in the
 * live description. A producer who moves the episode back opens them again.
 */
export function editLocks(stage: Stage): { cut: string | null; chapters: string | null } {
	return { cut: stageLock(stage, 'cut'), chapters: stageLock(stage, 'chapters') };
}
