/**
 * The keys of a search field's list of matches, as the W3C WAI-ARIA Authoring Practices Guide's
 * "Combobox" pattern describes them (tests/REFERENCES.md, "Accessibility"; from memory): Down Arrow
 * moves to the next option and Up Arrow to the previous one (here both wrap round), Enter accepts
 * the highlighted option, Escape closes the list; other keys stay the field's.
 */
import { describe, expect, test } from 'vitest';
import { listKeyAction } from '$lib/components/search-list';

describe('listKeyAction', () => {
	test('Down and Up move the highlight and wrap round the list', () => {
		expect(listKeyAction('ArrowDown', true, 3, 0)).toEqual({ highlight: 1 });
		expect(listKeyAction('ArrowDown', true, 3, 2)).toEqual({ highlight: 0 });
		expect(listKeyAction('ArrowUp', true, 3, 0)).toEqual({ highlight: 2 });
		expect(listKeyAction('ArrowUp', true, 3, 2)).toEqual({ highlight: 1 });
	});

	test('Enter picks the highlighted row; Escape closes the list, even an empty one', () => {
		expect(listKeyAction('Enter', true, 3, 1)).toEqual({ choose: 1 });
		expect(listKeyAction('Escape', true, 3, 1)).toEqual({ close: true });
		expect(listKeyAction('Escape', true, 0, 0)).toEqual({ close: true });
	});

	test('a closed or empty list leaves the keys to the field (Enter sends the form)', () => {
		for (const key of ['ArrowDown', 'ArrowUp', 'Enter', 'Escape'])
			expect(listKeyAction(key, false, 3, 0)).toBeNull();
		for (const key of ['ArrowDown', 'ArrowUp', 'Enter'])
			expect(listKeyAction(key, true, 0, 0)).toBeNull();
		expect(listKeyAction('a', true, 3, 0)).toBeNull();
		expect(listKeyAction('Tab', true, 3, 0)).toBeNull();
	});
});
