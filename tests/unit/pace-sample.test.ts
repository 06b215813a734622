import { describe, expect, test } from 'vitest';
import { PACE_SAMPLE, PACE_SAMPLE_WORDS } from '../../src/lib/script/pace-sample.ts';
import { calibratePace, countSpokenWords } from '../../src/lib/script/timing.ts';

describe('the paragraph a host reads to measure their pace', () => {
	test('its fixed word count is what countSpokenWords gives', () => {
		// Counted by hand: 98 whitespace-separated tokens; "95" is read "ninety-five" and "ft-lbs"
		// "foot pounds", one extra word each (common practice, from memory), so 100.
		expect(PACE_SAMPLE.split(/\s+/).length).toBe(98);
		expect(countSpokenWords(PACE_SAMPLE)).toBe(PACE_SAMPLE_WORDS);
		expect(PACE_SAMPLE_WORDS).toBe(100);
	});

	test('read in 40 s it is 150 wpm, the presented-speech default', () => {
		// Hand-worked: 100 words ÷ (40/60 min) = 150 wpm (common practice; Lucas, 125–150 wpm).
		expect(calibratePace([{ words: PACE_SAMPLE_WORDS, recordedSeconds: 40 }]).wordsPerMinute).toBe(
			150
		);
	});

	test('read in 10 s it is refused: 600 wpm is not a speaking pace', () => {
		// Hand-worked: 100 ÷ (10/60) = 600 wpm, far above radio bulletins' 160–180 (Rodero 2012).
		expect(calibratePace([{ words: PACE_SAMPLE_WORDS, recordedSeconds: 10 }])).toMatchObject({
			calibrated: false,
			refused: true,
			measuredWordsPerMinute: 600
		});
	});
});
