/**
 * The cut review's shared words and rules (client and server, no I/O): version labels, who may do
 * what, comment states, mentions, and how a comment moves to a new version.
 */
import type { Role } from './roles';

export type CutApproval = 'waiting' | 'approved' | 'changes';
export type CutCommentState = 'open' | 'resolved' | 'wont_change';

export const CUT_NOTE_MAX = 2000;
export const COMMENT_MAX = 4000;

/** Who may leave a comment on a version: the people who watch it for the channel. */
export const COMMENT_ROLES: readonly Role[] = ['producer', 'host', 'merch', 'editor'];
/** Who answers a comment for good (resolved, or won't change with a reason): the editor makes the change. */
export const SETTLE_ROLES: readonly Role[] = ['editor', 'producer'];
/** Who uploads versions, writes their change notes and confirms a carry-over offset. */
export const VERSION_ROLES: readonly Role[] = ['editor', 'producer'];
/** Who approves a version or asks for changes. */
export const APPROVE_ROLES: readonly Role[] = ['producer'];

export const versionLabel = (number: number) => `v${number}`;

export const APPROVAL_LABELS: Record<CutApproval, string> = {
	waiting: 'waiting for the producer',
	approved: 'approved',
	changes: 'changes asked'
};

export const COMMENT_STATE_LABELS: Record<CutCommentState, string> = {
	open: 'open',
	resolved: 'resolved',
	wont_change: "won't change"
};

/**
 * The crew members a comment mentions: `@` followed by a member's full name (case ignored, the
 * longest name wins where one is the start of another), each at most once, in the order named.
 */
export function mentionedMembers<T extends { name: string }>(
	body: string,
	members: readonly T[]
): T[] {
	const byLength = [...members].sort((a, b) => b.name.length - a.name.length);
	const lower = body.toLowerCase();
	const found: { at: number; member: T }[] = [];
	const taken = new Set<T>();
	for (let at = lower.indexOf('@'); at !== -1; at = lower.indexOf('@', at + 1)) {
		const rest = lower.slice(at + 1);
		const member = byLength.find((candidate) => {
			const name = candidate.name.toLowerCase();
			if (!name || !rest.startsWith(name)) return false;
			const next = rest.charAt(name.length);
			return next === '' || !/[\p{L}\p{N}]/u.test(next);
		});
		if (member && !taken.has(member)) {
			taken.add(member);
			found.push({ at, member });
		}
	}
	return found.map((entry) => entry.member);
}

/**
 * Where a carried comment lands on the new version: its frames on the version it came from plus
 * the confirmed offset. A comment pushed before frame 0 is held at 0 (a range keeps its length).
 */
export function carriedFrames(
	source: { startFrame: number; endFrame: number | null },
	offsetFrames: number
): { startFrame: number; endFrame: number | null } {
	const shift = Math.max(offsetFrames, -source.startFrame);
	return {
		startFrame: source.startFrame + shift,
		endFrame: source.endFrame === null ? null : source.endFrame + shift
	};
}

/** "3 open comments": counted words for the gate and the page. */
export function openCommentsText(count: number): string {
	return `${count} open comment${count === 1 ? '' : 's'}`;
}
