/**
 * A throttled person is told how long to wait, rounded up to whole minutes or hours so the time
 * named is never shorter than the Retry-After the server sends (RFC 9110 §10.2.3, seconds).
 */
import { describe, expect, test } from 'vitest';
import { waitInWords } from '$lib/wait-in-words';

describe('waitInWords', () => {
	test('rounds up to whole minutes, then to whole hours past the hour', () => {
		expect(waitInWords(1)).toBe('a minute');
		expect(waitInWords(60)).toBe('a minute');
		expect(waitInWords(61)).toBe('2 minutes');
		expect(waitInWords(900)).toBe('15 minutes');
		expect(waitInWords(3599)).toBe('an hour');
		expect(waitInWords(3600)).toBe('an hour');
		expect(waitInWords(3601)).toBe('2 hours');
	});
});
