/**
 * Gate checks: what must be true before an episode moves one stage forward. A pure function over a
 * snapshot of the episode's data (gathered on the server in one transaction, see
 * src/lib/server/episodes/stage-moves.ts), answering a list of refusal reasons. Each reason names the segment or
 * thing it is about, says what to do in the crew's words, and says whose job that is.
 *
 * The rules (our own, from the issue's wording):
 * - script → shoot: a rundown with a script in it, approved by a producer and unchanged since;
 *   a shot list (at least one shot) for every segment that needs footage; a camera operator assigned.
 * - shoot → edit: the shot lists as above, and for every planned shot at least one good take whose
 *   footage is uploaded; an editor assigned.
 * - edit → locked: valid chapters; every featured part linked to an active catalogue part; every
 *   caution of a flagged segment written, and on screen inside that segment's span on the edit
 *   timeline (its in and out points) for at least its reading time ($lib/reading-time: about 17
 *   characters a second, subtitle practice from memory): a "vehicle on stands" card in the end
 *   credits, or one flashed for a second, does not count.
 * - locked → published: everything the lock needs still holds, and a publish date is set. A caution
 *   never blocks publishing silently: each refusal names its segment. When the publish kit carries
 *   tracked links, the channel has a disclosure to place beside them (a channel that earns on its
 *   links says so); and the title is one video platforms take ($lib/publish-limits).
 * Moving back is never gated.
 */
import { hazardById, type HazardId } from './cautions';
import type { Role } from './roles';
import type { CutApproval } from './cut-review';
import type { Stage } from './stages';
import {
	capturedRateFit,
	framesToSeconds,
	programmeClock,
	programmeTimecode,
	secondsToFrames,
	type FrameRate,
	type ProgrammeTimecode
} from './timecode';
import { titleProblems } from './publish-limits';
import { READING_CHARACTERS_PER_SECOND, readableCharacters, readingSeconds } from './reading-time';

export type ScriptStatus = 'draft' | 'submitted' | 'approved' | 'returned';

export interface GateTake {
	clipName: string;
	good: boolean;
	/** True once the take's footage is uploaded (the take's footage id is set). */
	hasFootage: boolean;
	/** The uploaded clip's measured frame rate (null: not read, or no clip). */
	footageFrameRate?: string | null;
	/** True when ffprobe found the clip's frames unevenly spaced (a variable frame rate). */
	footageVariableRate?: boolean | null;
}

export interface GateShot {
	id: string;
	what: string;
	takes: GateTake[];
}

export interface GateCaution {
	hazard: HazardId;
	text: string;
	atFrame: number | null;
	/** Time on screen in frames at the episode's rate; null until set. */
	durationFrames: number | null;
}

export interface GateSegment {
	id: string;
	position: number;
	title: string;
	needsFootage: boolean;
	/** Spoken words in the segment's script. */
	words: number;
	hazards: HazardId[];
	/** The segment's in and out points on the edit timeline (frames, out exclusive); null until placed. */
	inFrame: number | null;
	outFrame: number | null;
	shots: GateShot[];
	/** The caution rows of this segment; only those of hazards in `hazards` count. */
	cautions: GateCaution[];
}

export interface GateSnapshot {
	stage: Stage;
	frameRate: FrameRate;
	/** How the episode labels times in its cut; left out: the rate's usual form from 00:00:00:00. */
	timecode?: ProgrammeTimecode;
	cutDurationFrames: number | null;
	publishDate: string | null;
	/** Role → name of the assigned person, for the roles that have someone. */
	assignments: Partial<Record<Role, string>>;
	script: {
		status: ScriptStatus;
		approvedFingerprint: string | null;
		currentFingerprint: string;
	};
	/** In rundown order. */
	segments: GateSegment[];
	/** Problems with the chapter list; null when there are no chapters (yet). */
	chapterProblems: string[] | null;
	/** Featured parts not linked to an active catalogue part, in words. */
	/** Why the featured parts aren't ready, each with whose job it is (merch links parts, the editor places notes). */
	featuredPartProblems: { message: string; fixedBy: Role }[];
	/**
	 * The cut review: the current (newest) version's number and the producer's answer (null: no cut
	 * uploaded), and how many comments are still open.
	 */
	cutReview: {
		current: { number: number; approval: CutApproval } | null;
		openComments: number;
	};
	/** What the publish gate reads besides the lock's rules. */
	publishing: {
		title: string;
		/** Parts in the publish kit: each goes out with a tracked link. */
		trackedLinks: number;
		/** The channel's disclosure; '' when none is set. */
		disclosure: string;
	};
}

export type GateRule =
	| 'rundown-empty'
	| 'script-empty'
	| 'script-not-approved'
	| 'script-changed'
	| 'shot-list-missing'
	| 'take-missing'
	| 'footage-missing'
	| 'footage-rate-mismatch'
	| 'assignee-missing'
	| 'chapters-missing'
	| 'chapter-problem'
	| 'part-problem'
	| 'caution-text-missing'
	| 'caution-unplaced'
	| 'caution-past-end'
	| 'segment-span-missing'
	| 'caution-outside-segment'
	| 'caution-duration-missing'
	| 'caution-too-short'
	| 'cut-missing'
	| 'cut-not-approved'
	| 'cut-comments-open'
	| 'publish-date-missing'
	| 'disclosure-missing'
	| 'title-refused';

export interface GateReason {
	rule: GateRule;
	/** The segment, shot or thing the reason is about, e.g. `Segment 4 “Swap the blocks”`. */
	subject: string;
	/** What is wrong and what to do, in one or two sentences. */
	message: string;
	/** Whose job it is to fix. */
	fixedBy: Role;
	segmentId?: string;
}

export const CHAPTERS_MISSING_MESSAGE = 'Mark at least three chapters on the edit timeline.';

/** `Segment 4 “Swap the blocks”`: one-based like the crew counts. */
export function segmentName(segment: Pick<GateSegment, 'position' | 'title'>): string {
	const title = segment.title.trim();
	return title
		? `Segment ${segment.position} “${title}”`
		: `Segment ${segment.position} (no title)`;
}

function shotListRule(snapshot: GateSnapshot): GateReason[] {
	return snapshot.segments
		.filter((segment) => segment.needsFootage && segment.shots.length === 0)
		.map((segment) => ({
			rule: 'shot-list-missing' as const,
			subject: segmentName(segment),
			message:
				'Needs footage but has no shot list yet: the camera operator adds at least one shot on the rundown (or untick “needs footage” if it is read over other footage).',
			fixedBy: 'camera' as const,
			segmentId: segment.id
		}));
}

function assigneeRule(snapshot: GateSnapshot, role: Role, words: string): GateReason[] {
	if (snapshot.assignments[role]) return [];
	return [
		{
			rule: 'assignee-missing',
			subject: 'Crew',
			message: `No ${words} is assigned to this episode: a producer assigns one on the episode page.`,
			fixedBy: 'producer'
		}
	];
}

function scriptRules(snapshot: GateSnapshot): GateReason[] {
	if (snapshot.segments.length === 0) {
		return [
			{
				rule: 'rundown-empty',
				subject: 'Rundown',
				message:
					'The rundown has no segments: the host adds them on the rundown page and writes each one.',
				fixedBy: 'host'
			}
		];
	}
	const reasons: GateReason[] = [];
	if (snapshot.segments.every((segment) => segment.words === 0)) {
		reasons.push({
			rule: 'script-empty',
			subject: 'Script',
			message: 'No segment has any script yet: the host writes the segments on the script page.',
			fixedBy: 'host'
		});
	}
	const { status, approvedFingerprint, currentFingerprint } = snapshot.script;
	if (
		status === 'approved' &&
		approvedFingerprint !== null &&
		approvedFingerprint !== currentFingerprint
	) {
		reasons.push({
			rule: 'script-changed',
			subject: 'Script',
			message:
				'The script changed after it was approved: a producer reads it again and approves it on the script page.',
			fixedBy: 'producer'
		});
	} else if (status !== 'approved') {
		const messages: Record<Exclude<ScriptStatus, 'approved'>, { text: string; fixedBy: Role }> = {
			draft: {
				text: 'The script is not approved: the host sends it for approval on the script page, then a producer approves it.',
				fixedBy: 'host'
			},
			submitted: {
				text: 'The script is waiting for a producer to approve it on the script page.',
				fixedBy: 'producer'
			},
			returned: {
				text: 'The producer returned the script with comments: the host works through them and sends it again.',
				fixedBy: 'host'
			}
		};
		reasons.push({
			rule: 'script-not-approved',
			subject: 'Script',
			message: messages[status].text,
			fixedBy: messages[status].fixedBy
		});
	}
	return reasons;
}

function footageRules(snapshot: GateSnapshot): GateReason[] {
	const reasons: GateReason[] = [];
	for (const segment of snapshot.segments) {
		for (const shot of segment.shots) {
			const subject = `Shot “${shot.what.trim() || 'untitled'}” in ${segmentName(segment).replace(/^Segment/, 'segment')}`;
			const goodTakes = shot.takes.filter((take) => take.good);
			if (goodTakes.length === 0) {
				reasons.push({
					rule: 'take-missing',
					subject,
					message:
						shot.takes.length === 0
							? 'No take is logged: film it and log the take on the shot list.'
							: 'No take is marked good: mark the usable take good, or film it again.',
					fixedBy: 'camera',
					segmentId: segment.id
				});
			} else if (!goodTakes.some((take) => take.hasFootage)) {
				const clips = goodTakes.map((take) => take.clipName).join(', ');
				reasons.push({
					rule: 'footage-missing',
					subject,
					message: `The good take (${clips}) has no footage uploaded: upload the clip from the card.`,
					fixedBy: 'camera',
					segmentId: segment.id
				});
			} else {
				const uploaded = goodTakes.filter((take) => take.hasFootage);
				const rateFits = (take: GateTake) =>
					capturedRateFit(take.footageFrameRate, snapshot.frameRate) !== 'different';
				const fits = uploaded.some((take) => rateFits(take) && !take.footageVariableRate);
				if (!fits && uploaded.some(rateFits)) {
					const clips = uploaded
						.filter((take) => take.footageVariableRate)
						.map((take) => take.clipName)
						.join(', ');
					reasons.push({
						rule: 'footage-rate-mismatch',
						subject,
						message: `The good take's clip (${clips}) has a variable frame rate: its frames are unevenly spaced, so it drifts out of sync in the cut. Upload a copy conformed to a constant ${snapshot.frameRate} fps, or mark another take good.`,
						fixedBy: 'camera',
						segmentId: segment.id
					});
				} else if (!fits) {
					const clips = uploaded
						.map((take) => `${take.clipName} at ${take.footageFrameRate} fps`)
						.join(', ');
					reasons.push({
						rule: 'footage-rate-mismatch',
						subject,
						message: `The good take's clip was recorded at another rate (${clips}) than the episode's ${snapshot.frameRate} fps: it would play at the wrong speed or drop frames. Upload a clip conformed to ${snapshot.frameRate} fps, or mark a take at the episode's rate good.`,
						fixedBy: 'camera',
						segmentId: segment.id
					});
				}
			}
		}
	}
	return reasons;
}

/** Seconds as the crew reads them: "6 s", "5.5 s". */
function secondsText(seconds: number): string {
	return `${Math.round(seconds * 10) / 10} s`;
}

/** Why a written caution is not where its hazard is shown: unplaced, past the cut, no span, or outside it. */
function placementProblem(
	snapshot: GateSnapshot,
	segment: GateSegment,
	caution: GateCaution,
	label: string
): { rule: GateRule; message: string } | null {
	const clock = programmeClock(
		snapshot.timecode ?? programmeTimecode({ frameRate: snapshot.frameRate })
	);
	const at = (frames: number) => clock.format(frames);
	if (caution.atFrame === null)
		return {
			rule: 'caution-unplaced',
			message: `The “${label}” caution is not placed in the cut: type the time where its card appears, on the rundown.`
		};
	if (snapshot.cutDurationFrames !== null && caution.atFrame >= snapshot.cutDurationFrames)
		return {
			rule: 'caution-past-end',
			message: `The “${label}” caution is placed at ${at(caution.atFrame)}, after the end of the cut (${at(snapshot.cutDurationFrames)}): place it inside the cut.`
		};
	if (segment.inFrame === null || segment.outFrame === null)
		return {
			rule: 'segment-span-missing',
			message: `The segment has no in and out points on the edit timeline, so its “${label}” caution can't be checked against the hazard: set them on the edit page.`
		};
	const endFrame = caution.atFrame + (caution.durationFrames ?? 0);
	// A span left longer than a cut shortened since still ends where the cut does.
	const spanEnd = Math.min(segment.outFrame, snapshot.cutDurationFrames ?? segment.outFrame);
	if (caution.atFrame >= segment.inFrame && endFrame <= spanEnd) return null;
	const shown =
		caution.durationFrames === null
			? `placed at ${at(caution.atFrame)}`
			: `on screen ${at(caution.atFrame)}–${at(endFrame)}`;
	return {
		rule: 'caution-outside-segment',
		message: `The “${label}” caution is ${shown}, outside its segment (${at(segment.inFrame)}–${at(spanEnd)}): place it where the hazardous work is shown, from its start to its end inside the segment.`
	};
}

function cautionRules(snapshot: GateSnapshot): GateReason[] {
	const reasons: GateReason[] = [];
	const rate = snapshot.frameRate;
	for (const segment of snapshot.segments) {
		for (const hazard of segment.hazards) {
			const label = hazardById(hazard)?.label ?? hazard;
			const caution = segment.cautions.find((candidate) => candidate.hazard === hazard);
			const base = { subject: segmentName(segment), segmentId: segment.id };
			if (!caution || caution.text.trim() === '') {
				reasons.push({
					...base,
					rule: 'caution-text-missing',
					message: `The “${label}” caution has no text: write it on the rundown (the default wording is a good start).`,
					fixedBy: 'host'
				});
				continue;
			}
			const placed = placementProblem(snapshot, segment, caution, label);
			if (placed) reasons.push({ ...base, ...placed, fixedBy: 'editor' });
			const characters = readableCharacters(caution.text);
			const neededSeconds = readingSeconds(characters);
			const need = `its ${characters} characters need ${neededSeconds} s at about ${READING_CHARACTERS_PER_SECOND} characters a second`;
			if (caution.durationFrames === null) {
				reasons.push({
					...base,
					rule: 'caution-duration-missing',
					message: `The “${label}” caution has no time on screen: ${need}. Type how long it shows, on the rundown.`,
					fixedBy: 'editor'
				});
			} else if (caution.durationFrames < secondsToFrames(neededSeconds, rate)) {
				reasons.push({
					...base,
					rule: 'caution-too-short',
					message: `The “${label}” caution is on screen for ${secondsText(framesToSeconds(caution.durationFrames, rate))}, too short to read: ${need}. Show it longer, or shorten the words.`,
					fixedBy: 'editor'
				});
			}
		}
	}
	return reasons;
}

function lockRules(snapshot: GateSnapshot): GateReason[] {
	const reasons: GateReason[] = [];
	if (snapshot.chapterProblems === null) {
		reasons.push({
			rule: 'chapters-missing',
			subject: 'Chapters',
			message: CHAPTERS_MISSING_MESSAGE,
			fixedBy: 'editor'
		});
	} else {
		for (const problem of snapshot.chapterProblems)
			reasons.push({
				rule: 'chapter-problem',
				subject: 'Chapters',
				message: problem,
				fixedBy: 'editor'
			});
	}
	for (const problem of snapshot.featuredPartProblems)
		reasons.push({
			rule: 'part-problem',
			subject: 'Featured parts',
			message: problem.message,
			fixedBy: problem.fixedBy
		});
	reasons.push(...cautionRules(snapshot));
	return reasons;
}

/**
 * Picture lock needs the current version approved with no open comments; each reason names who
 * fixes it. Only at edit → locked: from then on no version arrives and the review is fixed.
 */
function cutReviewRules(snapshot: GateSnapshot): GateReason[] {
	const { current, openComments } = snapshot.cutReview;
	const reasons: GateReason[] = [];
	if (!current) {
		reasons.push({
			rule: 'cut-missing',
			subject: 'Cut',
			message:
				'No cut is uploaded for review: the editor uploads one on the footage page (it becomes v1).',
			fixedBy: 'editor'
		});
		return reasons;
	}
	if (openComments > 0)
		reasons.push({
			rule: 'cut-comments-open',
			subject: 'Cut review',
			message: `${openComments} open comment${openComments === 1 ? '' : 's'} for the editor: resolve each one, or answer “won't change” with a reason, on the screening page.`,
			fixedBy: 'editor'
		});
	if (current.approval !== 'approved')
		reasons.push({
			rule: 'cut-not-approved',
			subject: 'Cut review',
			message:
				current.approval === 'changes'
					? `The producer asked for changes to v${current.number}: the editor uploads a new version, or the producer approves v${current.number}.`
					: `The producer has not approved v${current.number}: the producer watches it on the screening page and approves it.`,
			fixedBy: current.approval === 'changes' ? 'editor' : 'producer'
		});
	return reasons;
}

/** A disclosure beside tracked links, and a title platforms take: the publish gate's own rules. */
function publishingRules(snapshot: GateSnapshot): GateReason[] {
	const reasons: GateReason[] = [];
	const { title, trackedLinks, disclosure } = snapshot.publishing;
	if (trackedLinks > 0 && disclosure.trim() === '')
		reasons.push({
			rule: 'disclosure-missing',
			subject: 'Disclosure',
			message: `The publish kit has ${trackedLinks === 1 ? 'a tracked link' : `${trackedLinks} tracked links`} and the channel has no disclosure to put beside ${trackedLinks === 1 ? 'it' : 'them'}: a producer writes one under Channel settings, saying plainly how the channel earns on the links.`,
			fixedBy: 'producer'
		});
	for (const problem of titleProblems(title))
		reasons.push({
			rule: 'title-refused',
			subject: 'Title',
			message: problem,
			fixedBy: 'producer'
		});
	return reasons;
}

/** Every reason the episode may not move forward to `to` from its current stage; empty means the gate passes. */
export function gateChecksFor(snapshot: GateSnapshot, to: Stage): GateReason[] {
	switch (to) {
		case 'script':
			return [];
		case 'shoot':
			return [
				...scriptRules(snapshot),
				...shotListRule(snapshot),
				...assigneeRule(snapshot, 'camera', 'camera operator')
			];
		case 'edit':
			return [
				...shotListRule(snapshot),
				...footageRules(snapshot),
				...assigneeRule(snapshot, 'editor', 'editor')
			];
		case 'locked':
			return [...lockRules(snapshot), ...cutReviewRules(snapshot)];
		case 'published': {
			const reasons = lockRules(snapshot);
			if (!snapshot.publishDate) {
				reasons.push({
					rule: 'publish-date-missing',
					subject: 'Publish date',
					message: 'No publish date is set: a producer sets it on the episode page.',
					fixedBy: 'producer'
				});
			}
			reasons.push(...publishingRules(snapshot));
			return reasons;
		}
	}
}
