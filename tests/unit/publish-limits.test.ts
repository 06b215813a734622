/**
 * What video platforms count in a description and a title (tests/REFERENCES.md "Publish kit"):
 * the description limit of 5,000 stated in bytes of UTF-8 (from memory of a large platform's
 * upload documentation), titles of up to 100 characters, and `<` `>` refused in both (from memory).
 * UTF-8 byte lengths checked against Node's Buffer.byteLength (a general-purpose reference).
 */
import { describe, expect, test } from 'vitest';
import {
	DESCRIPTION_MAX,
	TITLE_MAX,
	descriptionLength,
	forbiddenMarks,
	titleLength
} from '$lib/publish-limits';

describe('description and title counts', () => {
	test('a description counts UTF-8 bytes: “°” is 2, an emoji 4', () => {
		// RFC 3629: U+00B0 encodes in 2 bytes, U+1F527 (wrench) in 4.
		expect(descriptionLength('Torque 95 ft·lbf at 20°C 🔧')).toBe(
			Buffer.byteLength('Torque 95 ft·lbf at 20°C 🔧', 'utf8')
		);
		expect(descriptionLength('°')).toBe(2);
		expect(descriptionLength('🔧')).toBe(4);
		expect(DESCRIPTION_MAX).toBe(5000);
	});

	test('a title counts UTF-16 code units, the stricter count: an emoji is 2', () => {
		// Unicode: U+1F527 lies outside the Basic Multilingual Plane, a surrogate pair in UTF-16.
		expect(titleLength('Rear shocks 🔧')).toBe(14);
		expect(TITLE_MAX).toBe(100);
	});

	test('< and > are found with their line and column', () => {
		expect(forbiddenMarks('Lift <2 in\nfits 33s > 31s')).toEqual([
			{ character: '<', line: 1, column: 6 },
			{ character: '>', line: 2, column: 10 }
		]);
		expect(forbiddenMarks('Nothing to flag')).toEqual([]);
	});
});
