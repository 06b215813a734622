/**
 * Matching a logged take to its uploaded clip by name. The file-name stem is held against Node's
 * own `path.parse(name).name` (Node.js `path` documentation: `name` is the base without its last
 * extension, and a leading dot starts no extension). That a camera names its file after the clip
 * it shows, plus an extension, is common practice.
 */
import path from 'node:path';
import fc from 'fast-check';
import { expect, test } from 'vitest';
import { clipsMatchingTake, fileStem } from '../../src/lib/shoot/clip-match';

test('a file name without its extension reads as Node’s path.parse reads it', () => {
	for (const name of [
		'ACAM_1001.mp4',
		'ACAM_1001.MOV',
		'clip.tar.gz',
		'.hidden',
		'noext',
		'a.b.c.mxf'
	])
		expect(fileStem(name)).toBe(path.posix.parse(name).name); // Node.js path.parse
	fc.assert(
		fc.property(
			fc.string({ maxLength: 30 }).filter((name) => !name.includes('/') && name.trim() === name),
			(name) => fileStem(name) === path.posix.parse(name).name // Node.js path.parse
		)
	);
});

test('an upload named ACAM_1001.mp4 matches the take logged as ACAM_1001, in any case', () => {
	const clips = [
		{ id: 'a', fileName: 'ACAM_1001.mp4', clipName: 'ACAM_1001' },
		{ id: 'b', fileName: 'acam_1002.mov', clipName: 'Pinion close-up' },
		{ id: 'c', fileName: 'ACAM_10011.mp4', clipName: 'ACAM_10011' }
	];
	expect(clipsMatchingTake('ACAM_1001', clips).map((clip) => clip.id)).toEqual(['a']);
	expect(clipsMatchingTake('acam_1001', clips).map((clip) => clip.id)).toEqual(['a']);
	expect(clipsMatchingTake('ACAM_1002', clips).map((clip) => clip.id)).toEqual(['b']);
	expect(clipsMatchingTake('Pinion close-up', clips).map((clip) => clip.id)).toEqual(['b']);
	expect(clipsMatchingTake('ACAM_100', clips)).toEqual([]);
	expect(clipsMatchingTake('  ', clips)).toEqual([]);
});
