/**
 * The rundown's small pure helpers: how typed durations are read, how durations and over/under are
 * written, and that the browser-side script limit is the server's. The formats are our own; the
 * arithmetic is plain sexagesimal time (60 s to the minute, 60 min to the hour; NIST SP 811 lists
 * min and h as units accepted for use with the SI).
 */
import { describe, expect, test } from 'vitest';
import {
	describeBalance,
	formatDuration,
	parseDurationText,
	SEGMENT_KINDS,
	SEGMENT_KIND_INFO,
	isSegmentKind
} from '../../src/lib/rundown.ts';
import { SCRIPT_CHARACTER_LIMIT, durationSchema } from '../../src/lib/schemas/episodes.ts';
import { MAX_SCRIPT_CHARACTERS } from '../../src/lib/server/episodes/markdown.ts';
import { runtimeBalance } from '../../src/lib/script/timing.ts';

describe('parseDurationText', () => {
	test.each([
		['90', 90],
		['1:30', 90],
		['0:05', 5],
		['12:00', 720],
		['1:02:03', 3723],
		['1m30s', 90],
		['2 min', 120],
		['45 s', 45],
		['  3:00  ', 180]
	])('reads %s as %i seconds', (text, seconds) => {
		expect(parseDurationText(text)).toBe(seconds);
	});

	test.each(['', '-30', '-1:30', '1:75', '1:60:00', 'about a minute', '1.5', '1:3'])(
		'refuses %s',
		(text) => {
			expect(parseDurationText(text)).toBeNull();
		}
	);
});

describe('durationSchema', () => {
	const schema = durationSchema('planned duration', 36_000);
	test('numbers and text both become whole seconds', () => {
		expect(schema.parse(75)).toBe(75);
		expect(schema.parse('1:15')).toBe(75);
	});
	test('a negative duration says so, in words', () => {
		const result = schema.safeParse('-0:10');
		expect(result.success).toBe(false);
		expect(result.error?.issues[0].message).toMatch(/can’t be negative/);
		expect(schema.safeParse(-10).success).toBe(false);
	});
	test('fractions of a second and very long durations are refused', () => {
		expect(schema.safeParse(1.5).error?.issues[0].message).toMatch(/whole seconds/);
		expect(schema.safeParse(36_001).error?.issues[0].message).toMatch(/longer than 10 hours/);
	});
});

describe('formatDuration and describeBalance', () => {
	test('write durations the way the crew reads them', () => {
		expect(formatDuration(0)).toBe('0 s');
		expect(formatDuration(45.4)).toBe('45 s');
		expect(formatDuration(59.6)).toBe('1:00');
		expect(formatDuration(840)).toBe('14:00');
		expect(formatDuration(3723)).toBe('1:02:03');
	});
	test('say over, under or on target with the size of the gap', () => {
		// runtimeBalance's window is the larger of ±5% and ±10 s (our own, src/lib/script/timing.ts).
		const over = runtimeBalance(900, 840);
		expect(describeBalance(over.deltaSeconds, over.state)).toBe('1:00 over');
		const under = runtimeBalance(700, 840);
		expect(describeBalance(under.deltaSeconds, under.state)).toBe('2:20 under');
		const on = runtimeBalance(845, 840);
		expect(describeBalance(on.deltaSeconds, on.state)).toBe('on target (+5 s)');
		expect(describeBalance(0, 'on')).toBe('on target');
	});
});

describe('segment kinds', () => {
	test('every kind has a label and a hint, and the list is closed', () => {
		for (const kind of SEGMENT_KINDS) {
			expect(SEGMENT_KIND_INFO[kind].label.length).toBeGreaterThan(0);
			expect(SEGMENT_KIND_INFO[kind].hint.length).toBeGreaterThan(0);
		}
		expect(isSegmentKind('teaser')).toBe(true);
		expect(isSegmentKind('montage')).toBe(false);
		expect(SEGMENT_KIND_INFO['call-to-action'].needsFootage).toBe(false);
	});
});

test('the browser’s script limit is the server’s', () => {
	expect(SCRIPT_CHARACTER_LIMIT).toBe(MAX_SCRIPT_CHARACTERS);
});
