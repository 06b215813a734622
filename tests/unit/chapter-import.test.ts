/**
 * What a marker file would change in the chapter list (the preview before an import). Pure
 * bookkeeping with no outside formula: the cases are worked by hand.
 */
import { describe, expect, test } from 'vitest';
import { chapterListBasis, planChapterImport } from '$lib/edit/chapter-import';

const existing = [
	{ id: 'a', startFrame: 0, title: 'Intro', version: 1 },
	{ id: 'b', startFrame: 300, title: 'Tools', version: 1 },
	{ id: 'c', startFrame: 900, title: 'Jack stands', version: 2 },
	{ id: 'd', startFrame: 1500, title: 'Wrap', version: 1 }
];

describe('planChapterImport', () => {
	test('unchanged, renamed, moved and added are told apart; chapters left out are kept', () => {
		const plan = planChapterImport(existing, [
			{ where: 'line 4', frame: 0, kind: 'chapter', name: 'Intro' },
			{ where: 'line 6', frame: 300, kind: null, name: 'Tools and safety gear' },
			{ where: 'line 8', frame: 960, kind: 'chapter', name: 'jack stands' },
			{ where: 'line 10', frame: 1200, kind: null, name: 'Torque check' },
			{ where: 'line 12', frame: 1200, kind: 'caution', name: 'Caution: hot brakes' }
		]);
		expect(plan.changes).toEqual([
			{ change: 'unchanged', where: 'line 4', id: 'a', frame: 0, title: 'Intro' },
			{
				change: 'renamed',
				where: 'line 6',
				id: 'b',
				frame: 300,
				fromTitle: 'Tools',
				title: 'Tools and safety gear'
			},
			{
				change: 'moved',
				where: 'line 8',
				id: 'c',
				fromFrame: 900,
				frame: 960,
				title: 'jack stands'
			},
			{ change: 'added', where: 'line 10', frame: 1200, title: 'Torque check' }
		]);
		expect(plan.kept).toEqual([{ id: 'd', frame: 1500, title: 'Wrap' }]);
		expect(plan.skipped).toBe(1);
	});

	test('an exact match is kept unchanged even when an earlier marker could rename it', () => {
		const plan = planChapterImport(existing.slice(0, 2), [
			{ where: 'a', frame: 300, kind: null, name: 'Something else' },
			{ where: 'b', frame: 300, kind: null, name: 'Tools' }
		]);
		expect(plan.changes.map((change) => change.change)).toEqual(['added', 'unchanged']);
	});

	test('the basis changes when any chapter’s version does', () => {
		const before = chapterListBasis(existing);
		expect(chapterListBasis([...existing].reverse())).toBe(before);
		expect(
			chapterListBasis(existing.map((c) => (c.id === 'c' ? { ...c, version: 3 } : c)))
		).not.toBe(before);
	});
});
