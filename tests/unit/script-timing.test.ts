import { describe, expect, test } from 'vitest';
import {
	CALIBRATED_PACE_RANGE,
	DEFAULT_WORDS_PER_MINUTE,
	calibratePace,
	countSpokenWords,
	estimateSpokenSeconds,
	runtimeBalance,
	runtimeToleranceSeconds
} from '../../src/lib/script/timing.ts';

// Word-counting rules are our own (documented in src/lib/script/timing.ts).
// Markdown syntax is as the CommonMark spec 0.31.2 and GitHub Flavored Markdown
// spec define it (from memory): what is a marker and what is content.
describe('countSpokenWords', () => {
	test('plain prose: same count as splitting on whitespace', () => {
		const prose = 'Jack up the front and set the stands under the frame rails';
		// Independent reference: for text with no Markdown, a whitespace split is the word count.
		expect(countSpokenWords(prose)).toBe(prose.split(/\s+/).length);
		expect(countSpokenWords(prose)).toBe(12);
	});

	test('figures and units count as read aloud; hyphenated and slash-joined words are one word', () => {
		// torque to (2) + ninety-five (2) + foot pounds (2); common practice, from memory
		// (tests/unit/spoken-numbers.test.ts has the rules).
		expect(countSpokenWords('torque to 95 ft-lbs')).toBe(6);
		// use the (2) + one half inch (3) + drive and/or the breaker bar (5)
		expect(countSpokenWords('use the 1/2-inch drive and/or the breaker bar')).toBe(10);
	});

	test('heading markers, emphasis, bullets and blockquote markers are not words', () => {
		const markdown = [
			'## Front end',
			'',
			'**Loosen** the _lug_ nuts ~~first~~.',
			'',
			'- one',
			'* two',
			'1. three',
			'',
			'> quoted line'
		].join('\n');
		// Front end (2) + Loosen the lug nuts first (5) + one two three (3) + quoted line (2)
		expect(countSpokenWords(markdown)).toBe(12);
	});

	test('emphasis inside a word does not split it', () => {
		expect(countSpokenWords('un**bolt** it')).toBe(2);
	});

	test('lone Markdown punctuation is not a word', () => {
		expect(countSpokenWords('***\n\n---\n\n* * *\n\n#')).toBe(0);
		expect(countSpokenWords('5 * 3 = 15')).toBe(3);
	});

	test('fenced code blocks, indented code and inline code are skipped entirely', () => {
		const markdown = [
			'Before the code.',
			'',
			'```text',
			'these five words are hidden',
			'```',
			'',
			'    indented code is hidden too',
			'',
			'Part `WX-2210-B` goes here.'
		].join('\n');
		// Before the code (3) + Part goes here (3)
		expect(countSpokenWords(markdown)).toBe(6);
	});

	test('link text counts, the URL does not', () => {
		expect(countSpokenWords('[the kit](https://parts.example/kit?id=42)')).toBe(2);
		expect(countSpokenWords('Grab [the kit](https://…) today')).toBe(4);
		expect(countSpokenWords('[the kit][ref]\n\n[ref]: https://parts.example/kit')).toBe(2);
	});

	test('bare URLs and e-mail addresses are 0 words', () => {
		expect(countSpokenWords('https://parts.example/kit')).toBe(0);
		expect(countSpokenWords('see www.parts.example/kit or <https://parts.example> now')).toBe(3);
		expect(countSpokenWords('write to crew@wrenchroll.example today')).toBe(3);
		expect(countSpokenWords('[https://parts.example](https://parts.example)')).toBe(0);
	});

	test('images are 0 words, alt text included', () => {
		expect(countSpokenWords('![a lifted pickup on stands](lift.jpg)')).toBe(0);
		expect(countSpokenWords('Look ![lifted pickup](lift.jpg) here')).toBe(2);
	});

	test('HTML tags are 0 words, text between tags counts, comments are 0', () => {
		expect(countSpokenWords('Torque <b>it</b> down')).toBe(3);
		expect(countSpokenWords('<div>\nSay this line\n</div>')).toBe(3);
		expect(countSpokenWords('<p>one</p><p>two</p>')).toBe(2);
		expect(countSpokenWords('un<b>bolt</b> it')).toBe(2);
		expect(countSpokenWords('Keep <!-- not this --> going')).toBe(2);
		expect(countSpokenWords('<br><hr><img src="x.png">')).toBe(0);
	});

	test('[[ … ]] directions are not spoken', () => {
		expect(countSpokenWords('Set the stands [[B-roll: jack stands]] under the rails')).toBe(6);
		expect(countSpokenWords('[[Wide shot, host walks in]]\n\nWelcome back')).toBe(2);
		expect(countSpokenWords('Tighten[[close-up]]it')).toBe(2);
		expect(countSpokenWords('Now [[B-roll: **torque** wrench https://clips.example/7]] done')).toBe(
			2
		);
	});

	test('escaped double brackets are spoken text, not a direction', () => {
		// "say", "this", "aloud" (the bare brackets hold no letter, so they are not words)
		expect(countSpokenWords('say \\[\\[ this ]] aloud')).toBe(3);
		// Unescaped, the same brackets make a direction: "say", "aloud".
		expect(countSpokenWords('say [[ this ]] aloud')).toBe(2);
	});

	test('an unclosed [[ does not swallow later paragraphs', () => {
		// "[[B-roll" (1) + "stands" (1) + "Second paragraph here" (3)
		expect(countSpokenWords('[[B-roll stands\n\nSecond paragraph here')).toBe(5);
	});

	test('single-bracket text is spoken', () => {
		expect(countSpokenWords('[pause] then go')).toBe(3);
	});

	test('tables: cell text counts, pipes and the delimiter row do not', () => {
		const table = '| Part | Torque |\n|---|---:|\n| lug nut | 95 ft-lbs |';
		// Part Torque lug nut (4) + ninety-five foot pounds (4)
		expect(countSpokenWords(table)).toBe(8);
	});

	test('task-list boxes are not words', () => {
		expect(countSpokenWords('- [ ] bleed brakes\n- [x] check torque')).toBe(4);
	});

	test('character references: &amp; is read as "and", &nbsp; separates words', () => {
		expect(countSpokenWords('nuts &amp; bolts')).toBe(3);
		expect(countSpokenWords('nuts & bolts')).toBe(3);
		expect(countSpokenWords('ten&nbsp;mil')).toBe(2);
	});

	test('an em dash between words separates them', () => {
		expect(countSpokenWords('tight—really tight')).toBe(3);
	});

	test('empty and whitespace-only scripts are 0 words', () => {
		expect(countSpokenWords('')).toBe(0);
		expect(countSpokenWords('  \n\t\n ')).toBe(0);
	});

	test('Windows line endings count the same as Unix ones', () => {
		expect(countSpokenWords('# Title\r\n\r\nOne two\r\nthree')).toBe(
			countSpokenWords('# Title\n\nOne two\nthree')
		);
	});
});

describe('estimateSpokenSeconds', () => {
	test('300 words at 150 wpm take 120 s', () => {
		// Hand-worked: 300 ÷ 150 = 2 min = 120 s. 150 wpm is the presented-speech
		// default (common practice; Lucas, The Art of Public Speaking, 125–150 wpm).
		expect(DEFAULT_WORDS_PER_MINUTE).toBe(150);
		expect(estimateSpokenSeconds(300, DEFAULT_WORDS_PER_MINUTE)).toBe(120);
	});

	test('faster pace gives a shorter time', () => {
		// Hand-worked: 170 words at 170 wpm (inside Rodero 2012's 160–180 bulletin range) = 60 s.
		expect(estimateSpokenSeconds(170, 170)).toBe(60);
		expect(estimateSpokenSeconds(0, 150)).toBe(0);
	});

	test('rejects a pace of 0 or less and negative word counts', () => {
		expect(() => estimateSpokenSeconds(100, 0)).toThrow(RangeError);
		expect(() => estimateSpokenSeconds(100, -5)).toThrow(RangeError);
		expect(() => estimateSpokenSeconds(-1, 150)).toThrow(RangeError);
	});
});

describe('calibratePace', () => {
	test('pools words over minutes instead of averaging per-take rates', () => {
		const samples = [
			{ words: 300, recordedSeconds: 100 },
			{ words: 100, recordedSeconds: 50 }
		];
		// Hand-worked: 400 words ÷ (150 s = 2.5 min) = 160 wpm.
		// (A mean of ratios would give (180 + 120) ÷ 2 = 150, which is not what we want.)
		expect(calibratePace(samples)).toMatchObject({
			wordsPerMinute: 160,
			basedOn: 2,
			calibrated: true
		});
	});

	test('ignores takes under 10 s or under 20 words', () => {
		const samples = [
			{ words: 300, recordedSeconds: 120 },
			{ words: 25, recordedSeconds: 9.9 },
			{ words: 19, recordedSeconds: 30 }
		];
		// Hand-worked: only the first is usable: 300 ÷ 2 min = 150 wpm.
		expect(calibratePace(samples)).toMatchObject({
			wordsPerMinute: 150,
			basedOn: 1,
			calibrated: true
		});
	});

	test('takes exactly at 10 s and 20 words are usable', () => {
		// Hand-worked: 20 words ÷ (10/60 min) = 120 wpm.
		expect(calibratePace([{ words: 20, recordedSeconds: 10 }])).toMatchObject({
			wordsPerMinute: 120,
			basedOn: 1,
			calibrated: true
		});
	});

	test('400 words in 30 s is refused as not a speaking pace, never "260, calibrated"', () => {
		// Hand-worked: 400 words ÷ 0.5 min = 800 wpm, three times radio-bulletin speed (160–180 wpm,
		// Rodero 2012; common practice, from memory). The old rule clamped it to 260 and called it
		// calibrated.
		const result = calibratePace([{ words: 400, recordedSeconds: 30 }]);
		expect(result.calibrated).toBe(false);
		expect(result.refused).toBe(true);
		expect(result.wordsPerMinute).toBe(DEFAULT_WORDS_PER_MINUTE);
		expect(result.measuredWordsPerMinute).toBe(800);
	});

	test('a pace below the speaking range is refused too, never raised to 80', () => {
		// Hand-worked: 20 words in 60 s = 20 wpm (a reading timed with a long pause, or wordless work).
		const result = calibratePace([{ words: 20, recordedSeconds: 60 }]);
		expect(result).toMatchObject({ calibrated: false, refused: true, measuredWordsPerMinute: 20 });
		expect(result.wordsPerMinute).toBe(DEFAULT_WORDS_PER_MINUTE);
	});

	test('the edges of the speaking range are accepted (our own range, 80–260 wpm)', () => {
		expect(CALIBRATED_PACE_RANGE).toEqual({ minimum: 80, maximum: 260 });
		// Hand-worked: 130 words in 30 s = 260 wpm; 40 words in 30 s = 80 wpm.
		expect(calibratePace([{ words: 130, recordedSeconds: 30 }])).toMatchObject({
			wordsPerMinute: 260,
			calibrated: true
		});
		expect(calibratePace([{ words: 40, recordedSeconds: 30 }])).toMatchObject({
			wordsPerMinute: 80,
			calibrated: true
		});
	});

	test('falls back to the default, or the given fallback, when nothing is usable', () => {
		expect(calibratePace([])).toMatchObject({
			wordsPerMinute: 150,
			basedOn: 0,
			calibrated: false,
			refused: false
		});
		expect(calibratePace([{ words: 5, recordedSeconds: 3 }], 140)).toMatchObject({
			wordsPerMinute: 140,
			basedOn: 0,
			calibrated: false,
			refused: false
		});
	});

	test('broken samples (NaN, infinite) are ignored rather than poisoning the total', () => {
		const samples = [
			{ words: Number.NaN, recordedSeconds: 60 },
			{ words: 150, recordedSeconds: Number.POSITIVE_INFINITY },
			{ words: 180, recordedSeconds: 60 }
		];
		expect(calibratePace(samples)).toMatchObject({
			wordsPerMinute: 180,
			basedOn: 1,
			calibrated: true
		});
	});
});

describe('runtimeBalance', () => {
	test('tolerance is the larger of 5% and 10 s (our own choice)', () => {
		// Hand-worked: 5% of 120 s = 6 s < 10 s → 10 s; 5% of 600 s = 30 s.
		expect(runtimeToleranceSeconds(120)).toBe(10);
		expect(runtimeToleranceSeconds(600)).toBe(30);
	});

	test('within tolerance is on, boundary included', () => {
		expect(runtimeBalance(630, 600)).toEqual({ deltaSeconds: 30, state: 'on', fraction: 1.05 });
		expect(runtimeBalance(570, 600)).toEqual({ deltaSeconds: -30, state: 'on', fraction: 0.95 });
		expect(runtimeBalance(130, 120).state).toBe('on');
	});

	test('beyond tolerance is over or under', () => {
		// Hand-worked: 700 − 600 = +100 s, 700 ÷ 600 = 7/6.
		const long = runtimeBalance(700, 600);
		expect(long.state).toBe('over');
		expect(long.deltaSeconds).toBe(100);
		expect(long.fraction).toBeCloseTo(7 / 6, 12);
		expect(runtimeBalance(109, 120)).toEqual({
			deltaSeconds: -11,
			state: 'under',
			fraction: 109 / 120
		});
		expect(runtimeBalance(569, 600).state).toBe('under');
	});

	test('rejects a target of 0 or less', () => {
		expect(() => runtimeBalance(60, 0)).toThrow(RangeError);
	});

	test('joins up with the estimate: 1,500 words against a 10-minute target is on time', () => {
		// Hand-worked: 1,500 words ÷ 150 wpm = 10 min = 600 s.
		expect(runtimeBalance(estimateSpokenSeconds(1500, 150), 600)).toEqual({
			deltaSeconds: 0,
			state: 'on',
			fraction: 1
		});
	});
});
