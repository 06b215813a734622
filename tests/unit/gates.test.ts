/**
 * Gate checks per stage. The rules are our own (written from issue 3's wording, see the header of
 * src/lib/gates.ts); these tests pin each one down with a snapshot that breaks exactly that rule,
 * and a snapshot that passes. Timecodes in messages are checked against SMPTE ST 12-1 worked values
 * (tests/REFERENCES.md, "Timecode": 17982 frames at 29.97 drop-frame is 00:10:00;00).
 */
import { describe, expect, test } from 'vitest';
import {
	CHAPTERS_MISSING_MESSAGE,
	gateChecksFor,
	segmentName,
	type GateSegment,
	type GateSnapshot
} from '../../src/lib/gates.ts';
import { mayMoveStage, moveDirection, nextStage } from '../../src/lib/stages.ts';

function segment(overrides: Partial<GateSegment> = {}): GateSegment {
	return {
		id: overrides.id ?? `segment-${overrides.position ?? 1}`,
		position: 1,
		title: 'Swap the blocks',
		needsFootage: true,
		words: 120,
		hazards: [],
		// The whole cut of ready() (2 × 17982 frames = 00:20:00;00 at 29.97 DF).
		inFrame: 0,
		outFrame: 17982 * 2,
		shots: [
			{
				id: 'shot-1',
				what: 'Wide of the rear axle',
				takes: [{ clipName: 'ACAM_1004', good: true, hasFootage: true }]
			}
		],
		cautions: [],
		...overrides
	};
}

/** A snapshot that passes every gate; each test breaks one thing. */
function ready(overrides: Partial<GateSnapshot> = {}): GateSnapshot {
	return {
		stage: 'script',
		frameRate: '29.97',
		cutDurationFrames: 17982 * 2,
		publishDate: '2027-01-15',
		assignments: { host: 'Rico', camera: 'Mika', editor: 'Jules', merch: 'Priya' },
		script: { status: 'approved', approvedFingerprint: 'abc', currentFingerprint: 'abc' },
		segments: [
			segment({ position: 1, id: 's1', title: 'Cold open' }),
			segment({ position: 2, id: 's2' })
		],
		chapterProblems: [],
		featuredPartProblems: [],
		cutReview: { current: { number: 1, approval: 'approved' }, openComments: 0 },
		publishing: {
			title: 'Coil spacer lift on the project pickup',
			trackedLinks: 3,
			disclosure: 'We earn on parts bought through the links below.'
		},
		...overrides
	};
}

const rules = (snapshot: GateSnapshot, to: Parameters<typeof gateChecksFor>[1]) =>
	gateChecksFor(snapshot, to).map((reason) => reason.rule);

describe('every gate passes for a finished episode', () => {
	test.each(['shoot', 'edit', 'locked', 'published'] as const)('to %s: no reasons', (to) => {
		expect(gateChecksFor(ready(), to)).toEqual([]);
	});
	test('moving back (to script) is never gated', () => {
		expect(
			gateChecksFor(
				ready({
					segments: [],
					script: { status: 'draft', approvedFingerprint: null, currentFingerprint: 'x' }
				}),
				'script'
			)
		).toEqual([]);
	});
});

describe('script → shoot', () => {
	test('an empty rundown is refused, and says where to add segments', () => {
		const reasons = gateChecksFor(ready({ segments: [] }), 'shoot');
		expect(reasons.map((r) => r.rule)).toContain('rundown-empty');
		expect(reasons.find((r) => r.rule === 'rundown-empty')!.message).toMatch(/rundown page/);
	});

	test('a rundown with no words at all is refused', () => {
		expect(rules(ready({ segments: [segment({ words: 0 })] }), 'shoot')).toContain('script-empty');
	});

	test.each([
		['draft', /sends it for approval/, 'host'],
		['submitted', /waiting for a producer/, 'producer'],
		['returned', /returned the script with comments/, 'host']
	] as const)('a %s script is refused with the next step', (status, message, fixedBy) => {
		const reasons = gateChecksFor(
			ready({ script: { status, approvedFingerprint: null, currentFingerprint: 'abc' } }),
			'shoot'
		);
		expect(reasons).toHaveLength(1);
		expect(reasons[0]).toMatchObject({ rule: 'script-not-approved', fixedBy });
		expect(reasons[0].message).toMatch(message);
	});

	test('a script edited after approval is refused until it is approved again', () => {
		const reasons = gateChecksFor(
			ready({
				script: { status: 'approved', approvedFingerprint: 'abc', currentFingerprint: 'def' }
			}),
			'shoot'
		);
		expect(reasons.map((r) => r.rule)).toEqual(['script-changed']);
		expect(reasons[0].fixedBy).toBe('producer');
	});

	test('a segment that needs footage but has no shots is named, and its camera job stated', () => {
		const reasons = gateChecksFor(
			ready({
				segments: [
					segment({ position: 1, id: 'a' }),
					segment({ position: 2, id: 'b', title: 'Torque the U-bolts', shots: [] })
				]
			}),
			'shoot'
		);
		expect(reasons).toHaveLength(1);
		expect(reasons[0]).toMatchObject({
			rule: 'shot-list-missing',
			subject: 'Segment 2 “Torque the U-bolts”',
			segmentId: 'b',
			fixedBy: 'camera'
		});
		expect(reasons[0].message).toMatch(/adds at least one shot/);
	});

	test('a segment read over other footage (needs footage unticked) needs no shots', () => {
		expect(
			gateChecksFor(
				ready({
					segments: [
						segment({ position: 1 }),
						segment({ position: 2, id: 'cta', needsFootage: false, shots: [] })
					]
				}),
				'shoot'
			)
		).toEqual([]);
	});

	test('no camera operator assigned is refused', () => {
		const reasons = gateChecksFor(ready({ assignments: { host: 'Rico' } }), 'shoot');
		expect(reasons.map((r) => r.rule)).toEqual(['assignee-missing']);
		expect(reasons[0].message).toMatch(/camera operator/);
	});

	test('several problems are all reported at once, not one per try', () => {
		const snapshot = ready({
			assignments: {},
			script: { status: 'draft', approvedFingerprint: null, currentFingerprint: 'x' },
			segments: [segment({ shots: [] }), segment({ position: 2, id: 's2', shots: [] })]
		});
		expect(rules(snapshot, 'shoot')).toEqual([
			'script-not-approved',
			'shot-list-missing',
			'shot-list-missing',
			'assignee-missing'
		]);
	});
});

describe('shoot → edit', () => {
	const shootSnapshot = (shots: GateSegment['shots']) =>
		ready({ stage: 'shoot', segments: [segment({ shots })] });

	test('a shot with no take is refused, naming the shot and its segment', () => {
		const reasons = gateChecksFor(
			shootSnapshot([{ id: 'x', what: 'Close-up of the block', takes: [] }]),
			'edit'
		);
		expect(reasons).toHaveLength(1);
		expect(reasons[0]).toMatchObject({
			rule: 'take-missing',
			subject: 'Shot “Close-up of the block” in segment 1 “Swap the blocks”'
		});
		expect(reasons[0].message).toMatch(/No take is logged/);
	});

	test('a shot whose takes are all no good is refused', () => {
		const reasons = gateChecksFor(
			shootSnapshot([
				{ id: 'x', what: 'Wide', takes: [{ clipName: 'A002', good: false, hasFootage: true }] }
			]),
			'edit'
		);
		expect(reasons[0].rule).toBe('take-missing');
		expect(reasons[0].message).toMatch(/No take is marked good/);
	});

	test('a good take without uploaded footage is refused, naming the clip', () => {
		const reasons = gateChecksFor(
			shootSnapshot([
				{ id: 'x', what: 'Wide', takes: [{ clipName: 'ACAM_3011', good: true, hasFootage: false }] }
			]),
			'edit'
		);
		expect(reasons.map((r) => r.rule)).toEqual(['footage-missing']);
		expect(reasons[0].message).toContain('ACAM_3011');
	});

	test('one good take with footage among bad ones is enough', () => {
		const takes = [
			{ clipName: 'A1', good: false, hasFootage: true },
			{ clipName: 'A2', good: true, hasFootage: true }
		];
		expect(gateChecksFor(shootSnapshot([{ id: 'x', what: 'Wide', takes }]), 'edit')).toEqual([]);
	});

	test('the shot list rule still holds, and an editor must be assigned', () => {
		const snapshot = ready({
			stage: 'shoot',
			assignments: { camera: 'Mika' },
			segments: [segment({ shots: [] })]
		});
		expect(rules(snapshot, 'edit')).toEqual(['shot-list-missing', 'assignee-missing']);
	});
});

describe('edit → locked', () => {
	const flagged = (cautions: GateSegment['cautions']) =>
		ready({
			stage: 'edit',
			segments: [segment({ position: 3, title: 'Bleed the brakes', hazards: ['brakes'], cautions })]
		});

	test('no chapters yet is refused with the chapters message', () => {
		const reasons = gateChecksFor(ready({ stage: 'edit', chapterProblems: null }), 'locked');
		expect(reasons).toEqual([
			{
				rule: 'chapters-missing',
				subject: 'Chapters',
				message: CHAPTERS_MISSING_MESSAGE,
				fixedBy: 'editor'
			}
		]);
		expect(CHAPTERS_MISSING_MESSAGE).toBe('Mark at least three chapters on the edit timeline.');
	});

	test('each chapter problem becomes a reason', () => {
		const reasons = gateChecksFor(
			ready({
				stage: 'edit',
				chapterProblems: ['The first chapter must start at 0:00.', 'Chapter 3 is 6 s long.']
			}),
			'locked'
		);
		expect(reasons.map((r) => r.message)).toEqual([
			'The first chapter must start at 0:00.',
			'Chapter 3 is 6 s long.'
		]);
	});

	test('each featured part problem becomes a reason for whoever fixes it', () => {
		const reasons = gateChecksFor(
			ready({
				stage: 'edit',
				featuredPartProblems: [
					{ message: 'KBS-BL-OLD is discontinued: link a current part.', fixedBy: 'merch' },
					{
						message:
							'KBS-BS-6T is on a note with no program time: the editor places the note in the cut.',
						fixedBy: 'editor'
					}
				]
			}),
			'locked'
		);
		expect(reasons).toMatchObject([
			{ rule: 'part-problem', fixedBy: 'merch' },
			{ rule: 'part-problem', fixedBy: 'editor' }
		]);
	});

	test('a flagged segment with an unplaced caution is refused, naming the segment and the hazard', () => {
		const reasons = gateChecksFor(
			flagged([
				{ hazard: 'brakes', text: 'Have brake work inspected.', atFrame: null, durationFrames: 300 }
			]),
			'locked'
		);
		expect(reasons).toHaveLength(1);
		expect(reasons[0]).toMatchObject({
			rule: 'caution-unplaced',
			subject: 'Segment 3 “Bleed the brakes”',
			fixedBy: 'editor'
		});
		expect(reasons[0].message).toMatch(/“Brakes” caution is not placed/);
	});

	test('a placed caution passes', () => {
		expect(
			gateChecksFor(
				flagged([
					{
						hazard: 'brakes',
						text: 'Have brake work inspected.',
						atFrame: 1800,
						durationFrames: 300
					}
				]),
				'locked'
			)
		).toEqual([]);
	});

	test('a caution placed after the end of the cut is refused with both timecodes (SMPTE ST 12-1 drop-frame labels)', () => {
		const snapshot = {
			...flagged([
				{
					hazard: 'brakes' as const,
					text: 'Inspect it.',
					atFrame: 17982 + 1800,
					durationFrames: 300
				}
			]),
			cutDurationFrames: 17982
		};
		const reasons = gateChecksFor(snapshot, 'locked');
		expect(reasons[0].rule).toBe('caution-past-end');
		// 17982 frames = 00:10:00;00 and 19782 = 00:11:00;02 at 29.97 DF
		// (tests/REFERENCES.md, "Timecode"; frame 1800 ↔ 00:01:00;02).
		expect(reasons[0].message).toContain('00:11:00;02');
		expect(reasons[0].message).toContain('00:10:00;00');
	});

	test('a flag with no caution row, or an emptied caution text, is refused for the host', () => {
		expect(gateChecksFor(flagged([]), 'locked')).toMatchObject([
			{ rule: 'caution-text-missing', fixedBy: 'host' }
		]);
		expect(
			gateChecksFor(
				flagged([{ hazard: 'brakes', text: '   ', atFrame: 10, durationFrames: 300 }]),
				'locked'
			)
		).toMatchObject([{ rule: 'caution-text-missing' }]);
	});

	test('a caution of a hazard no longer flagged does not count', () => {
		const snapshot = ready({
			stage: 'edit',
			segments: [
				segment({
					hazards: [],
					cautions: [{ hazard: 'steering', text: 'x', atFrame: null, durationFrames: 300 }]
				})
			]
		});
		expect(gateChecksFor(snapshot, 'locked')).toEqual([]);
	});

	test('each of several flags on one segment needs its own placed caution', () => {
		const snapshot = ready({
			stage: 'edit',
			segments: [
				segment({
					hazards: ['raised-vehicle', 'brakes'],
					cautions: [
						{ hazard: 'raised-vehicle', text: 'Stands.', atFrame: 30, durationFrames: 300 },
						{ hazard: 'brakes', text: 'Inspect.', atFrame: null, durationFrames: 300 }
					]
				})
			]
		});
		const reasons = gateChecksFor(snapshot, 'locked');
		expect(reasons).toHaveLength(1);
		expect(reasons[0].message).toMatch(/Brakes/);
	});
});

describe('edit → locked: a caution on screen inside its segment, long enough to read', () => {
	// Frames at 29.97 DF (tests/REFERENCES.md, "Timecode", SMPTE ST 12-1): 1800 ↔ 00:01:00;02,
	// 3600 ↔ 00:02:00;04, 17982 ↔ 00:10:00;00. Reading time: characters ÷ 17, rounded up
	// (common practice for subtitles, from memory; tests/REFERENCES.md, "Reading speed").
	const STANDS =
		'Use rated jack stands on solid, level ground. Never work under a vehicle held up only by a jack.';
	// 96 characters ÷ 17 = 5.6 → 6 s; 6 s at 30000/1001 fps = 179.8 → 180 frames.
	const jackedUp = (
		caution: Partial<GateSegment['cautions'][number]>,
		span = { inFrame: 1800, outFrame: 3600 }
	) =>
		ready({
			stage: 'edit',
			segments: [
				segment({
					position: 2,
					title: 'Jack it up',
					hazards: ['raised-vehicle'],
					...span,
					cautions: [
						{
							hazard: 'raised-vehicle',
							text: STANDS,
							atFrame: 1900,
							durationFrames: 180,
							...caution
						}
					]
				})
			]
		});

	test('the default stands caution is 96 characters: 6 s to read (96 ÷ 17 = 5.6)', () => {
		expect(STANDS.length).toBe(96);
		expect(gateChecksFor(jackedUp({}), 'locked')).toEqual([]);
	});

	test('a caution placed in the end credits, outside its segment, is refused naming the segment and both spans', () => {
		const reasons = gateChecksFor(jackedUp({ atFrame: 17000 }), 'locked');
		expect(reasons).toHaveLength(1);
		expect(reasons[0]).toMatchObject({
			rule: 'caution-outside-segment',
			subject: 'Segment 2 “Jack it up”',
			fixedBy: 'editor'
		});
		expect(reasons[0].message).toContain('“Vehicle raised on stands” caution');
		expect(reasons[0].message).toContain('00:01:00;02–00:02:00;04'); // the segment's span
	});

	test('a caution that starts inside the segment but runs past its out point is refused', () => {
		expect(rules(jackedUp({ atFrame: 3500 }), 'locked')).toEqual(['caution-outside-segment']);
		// Ending exactly on the out point (exclusive) is inside: 3420 + 180 = 3600.
		expect(rules(jackedUp({ atFrame: 3420 }), 'locked')).toEqual([]);
		expect(rules(jackedUp({ atFrame: 1799 }), 'locked')).toEqual(['caution-outside-segment']);
	});

	test('a caution shown shorter than its reading time is refused with the seconds it needs', () => {
		const reasons = gateChecksFor(jackedUp({ durationFrames: 60 }), 'locked');
		expect(reasons).toHaveLength(1);
		expect(reasons[0].rule).toBe('caution-too-short');
		// 60 frames at 29.97 = 2.002 s → "2 s"; 96 characters need 6 s.
		expect(reasons[0].message).toContain('on screen for 2 s');
		expect(reasons[0].message).toContain('96 characters need 6 s');
		// 179 frames is 5.97 s: still a frame short of 6 s.
		expect(rules(jackedUp({ durationFrames: 179 }), 'locked')).toEqual(['caution-too-short']);
	});

	test('a caution with no time on screen is refused', () => {
		expect(rules(jackedUp({ durationFrames: null }), 'locked')).toEqual([
			'caution-duration-missing'
		]);
	});

	test('a segment with no in and out points is refused for its caution, for the editor', () => {
		const reasons = gateChecksFor(
			jackedUp({}, { inFrame: null, outFrame: null } as never),
			'locked'
		);
		expect(reasons).toMatchObject([
			{ rule: 'segment-span-missing', subject: 'Segment 2 “Jack it up”', fixedBy: 'editor' }
		]);
	});

	test('the same rules hold at the publish gate', () => {
		const snapshot = { ...jackedUp({ atFrame: 17000 }), stage: 'locked' as const };
		expect(rules(snapshot, 'published')).toEqual(['caution-outside-segment']);
	});
});

describe('locked → published', () => {
	test('an unplaced caution still refuses publishing, naming the segment', () => {
		const snapshot = ready({
			stage: 'locked',
			segments: [
				segment({
					title: 'Jack it up',
					hazards: ['raised-vehicle'],
					cautions: [
						{ hazard: 'raised-vehicle', text: 'Stands.', atFrame: null, durationFrames: 300 }
					]
				})
			]
		});
		const reasons = gateChecksFor(snapshot, 'published');
		expect(reasons).toMatchObject([
			{ rule: 'caution-unplaced', subject: 'Segment 1 “Jack it up”' }
		]);
	});

	test('a missing publish date is refused', () => {
		expect(rules(ready({ stage: 'locked', publishDate: null }), 'published')).toEqual([
			'publish-date-missing'
		]);
	});
});

describe('locked → published: disclosure beside tracked links, and a title platforms take', () => {
	// A channel that earns on its links says so beside them (tests/REFERENCES.md, "Publish kit":
	// common practice, from memory).
	const publishing = (changes: Partial<GateSnapshot['publishing']>) =>
		ready({ stage: 'locked', publishing: { ...ready().publishing, ...changes } });

	test('tracked links with no disclosure are refused, and the reason says who writes it and where', () => {
		const reasons = gateChecksFor(publishing({ disclosure: '' }), 'published');
		expect(reasons).toEqual([
			{
				rule: 'disclosure-missing',
				subject: 'Disclosure',
				message: expect.stringMatching(/3 tracked links.*no disclosure.*Channel settings/),
				fixedBy: 'producer'
			}
		]);
	});

	test('a disclosure of only spaces and line breaks counts as none; one link is said as one', () => {
		const reasons = gateChecksFor(
			publishing({ disclosure: ' \n\t ', trackedLinks: 1 }),
			'published'
		);
		expect(reasons.map((reason) => reason.rule)).toEqual(['disclosure-missing']);
		expect(reasons[0].message).toMatch(/^The publish kit has a tracked link and .* beside it:/);
	});

	test('no tracked links, no disclosure needed', () => {
		expect(gateChecksFor(publishing({ disclosure: '', trackedLinks: 0 }), 'published')).toEqual([]);
	});

	test('the disclosure is the publish gate’s rule only: picture lock does not ask for it', () => {
		expect(gateChecksFor(publishing({ disclosure: '' }), 'locked')).toEqual([]);
	});

	test('a title over the 100 characters platforms take is refused with how much to cut', () => {
		// 100 characters is the platforms' title limit (tests/REFERENCES.md, "Publish kit": from memory).
		expect(gateChecksFor(publishing({ title: 'x'.repeat(100) }), 'published')).toEqual([]);
		const reasons = gateChecksFor(publishing({ title: 'x'.repeat(101) }), 'published');
		expect(reasons).toMatchObject([
			{ rule: 'title-refused', subject: 'Title', fixedBy: 'producer' }
		]);
		expect(reasons[0].message).toMatch(/101 characters; video platforms take 100: shorten it by 1/);
	});

	test('the title counts UTF-16 code units, so 50 emoji (100 units) pass and 51 do not', () => {
		// U+1F527 is a surrogate pair in UTF-16: 2 code units (Unicode Standard §3.9, public).
		expect(gateChecksFor(publishing({ title: '\u{1F527}'.repeat(50) }), 'published')).toEqual([]);
		expect(rules(publishing({ title: '\u{1F527}'.repeat(51) }), 'published')).toEqual([
			'title-refused'
		]);
	});
});

describe('segment names in reasons', () => {
	test('are one-based with the title in quotes, or say there is no title', () => {
		expect(segmentName({ position: 4, title: ' Swap the blocks ' })).toBe(
			'Segment 4 “Swap the blocks”'
		);
		expect(segmentName({ position: 2, title: '' })).toBe('Segment 2 (no title)');
	});
});

describe('who may move a stage (our own rule, src/lib/stages.ts)', () => {
	const assignments = { host: 'host-id', camera: 'camera-id', editor: 'editor-id' };

	test('forward is exactly one station; back is any earlier station', () => {
		expect(moveDirection('script', 'shoot')).toBe('forward');
		expect(moveDirection('script', 'edit')).toBeNull();
		expect(moveDirection('locked', 'script')).toBe('back');
		expect(moveDirection('edit', 'edit')).toBeNull();
		expect(nextStage('published')).toBeNull();
	});

	test('a producer moves forward and back', () => {
		const producer = { personId: 'p', roles: ['producer'] as const };
		expect(mayMoveStage(producer, assignments, 'script', 'shoot')).toBe(true);
		expect(mayMoveStage(producer, assignments, 'edit', 'script')).toBe(true);
		expect(mayMoveStage(producer, assignments, 'locked', 'published')).toBe(true);
	});

	test('the assigned host moves script forward; another host does not; nobody but a producer moves back', () => {
		expect(
			mayMoveStage({ personId: 'host-id', roles: ['host'] }, assignments, 'script', 'shoot')
		).toBe(true);
		expect(
			mayMoveStage({ personId: 'other-host', roles: ['host'] }, assignments, 'script', 'shoot')
		).toBe(false);
		expect(
			mayMoveStage({ personId: 'host-id', roles: ['host'] }, assignments, 'shoot', 'script')
		).toBe(false);
		expect(
			mayMoveStage({ personId: 'host-id', roles: ['host'] }, assignments, 'shoot', 'edit')
		).toBe(false);
	});

	test('the assigned camera operator moves shoot forward, the assigned editor moves edit forward, nobody but a producer publishes', () => {
		expect(
			mayMoveStage({ personId: 'camera-id', roles: ['camera'] }, assignments, 'shoot', 'edit')
		).toBe(true);
		expect(
			mayMoveStage({ personId: 'editor-id', roles: ['editor'] }, assignments, 'edit', 'locked')
		).toBe(true);
		expect(
			mayMoveStage({ personId: 'editor-id', roles: ['editor'] }, assignments, 'locked', 'published')
		).toBe(false);
		expect(
			mayMoveStage(
				{ personId: 'm', roles: ['merch'] },
				{ ...assignments, merch: 'm' },
				'locked',
				'published'
			)
		).toBe(false);
	});

	test('an assignee who lost the role may not move it', () => {
		expect(
			mayMoveStage({ personId: 'camera-id', roles: ['merch'] }, assignments, 'shoot', 'edit')
		).toBe(false);
	});
});

describe('footage recorded at another frame rate than the episode', () => {
	// A clip at a rate other than the programme's plays at the wrong speed or drops and repeats
	// frames once cut in (the 1000/1001 family and whole rates are distinct; tests/REFERENCES.md
	// "Frame rates"). Capture at a whole multiple (50 for 25, 119.88 for 29.97) is overcranked for
	// slow motion and conformed on purpose (common practice), so it passes.
	const withRate = (measured: string | null) =>
		ready({
			stage: 'shoot',
			frameRate: '29.97',
			segments: [
				segment({
					shots: [
						{
							id: 'shot-1',
							what: 'Wide of the rear axle',
							takes: [
								{ clipName: 'ACAM_1004', good: true, hasFootage: true, footageFrameRate: measured }
							]
						}
					]
				})
			]
		});

	test('a good take’s clip at 30 fps in a 29.97 episode holds shoot → edit, naming both rates', () => {
		const reasons = gateChecksFor(withRate('30'), 'edit');
		expect(reasons.map((reason) => reason.rule)).toEqual(['footage-rate-mismatch']);
		expect(reasons[0].message).toContain('30 fps');
		expect(reasons[0].message).toContain('29.97 fps');
		expect(reasons[0].message).toContain('ACAM_1004');
		expect(reasons[0].fixedBy).toBe('camera');
	});

	test('the same rate, an overcranked whole multiple, or an unread rate passes', () => {
		for (const measured of ['29.97', '59.94', '119.88', null])
			expect(rules(withRate(measured), 'edit'), String(measured)).toEqual([]);
	});

	test('a good take’s clip at the right average rate but variable spacing holds shoot → edit', () => {
		// Phones and screen recorders space frames unevenly (variable frame rate); edit systems
		// expect a constant rate and drift out of sync otherwise (common practice: conform first).
		const snapshot = withRate('29.97');
		snapshot.segments[0].shots[0].takes[0].footageVariableRate = true;
		const reasons = gateChecksFor(snapshot, 'edit');
		expect(reasons.map((reason) => reason.rule)).toEqual(['footage-rate-mismatch']);
		expect(reasons[0].message).toContain('variable frame rate');
		expect(reasons[0].message).toContain('ACAM_1004');
	});
});
