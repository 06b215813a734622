/**
 * The rule table of what each stage fixes ($lib/stages: stageLock). The rule is our own, written from
 * the trade's meaning of the stages (tests/REFERENCES.md, "Production stages", common practice, from
 * memory): picture lock fixes the cut's timing and what it is made of; publishing puts chapters,
 * links and on-screen cards in front of viewers.
 */
import { describe, expect, test } from 'vitest';
import {
	LOCKABLE,
	STAGES,
	editLocks,
	reopensAt,
	stageLock,
	stageLocks,
	type Lockable
} from '../../src/lib/stages.ts';

describe('stageLock', () => {
	test('nothing is fixed while the episode is in script, shoot or edit', () => {
		for (const stage of ['script', 'shoot', 'edit'] as const)
			for (const what of LOCKABLE) expect(stageLock(stage, what), `${stage} ${what}`).toBeNull();
	});

	test('picture lock fixes the cut, the rundown, the script and the shot list (common practice: the picture is final)', () => {
		const fixed = LOCKABLE.filter((what) => stageLock('locked', what) !== null);
		expect(fixed.sort()).toEqual(['cut', 'rundown', 'script', 'shots']);
		for (const what of fixed) {
			expect(stageLock('locked', what)).toMatch(/^The picture is locked/);
			expect(stageLock('locked', what)).toContain('A producer can move it back to Edit');
		}
	});

	test('publishing fixes every kind of work, each with the stage that opens it again', () => {
		const reopen: Record<Lockable, string> = {
			cut: 'Edit',
			rundown: 'Edit',
			script: 'Edit',
			shots: 'Edit',
			notes: 'Locked',
			chapters: 'Locked',
			cards: 'Locked'
		};
		for (const what of LOCKABLE) {
			const reason = stageLock('published', what)!;
			expect(reason, what).toMatch(/^This episode is published: /);
			expect(reason, what).toContain(
				`A producer can move it back to ${reopen[what]} to change it.`
			);
		}
	});

	test('moving back to the stage a reason names opens that work again', () => {
		for (const what of LOCKABLE) {
			expect(stageLock(reopensAt(what), what), what).toBeNull();
			// …and every stage before it is open too.
			for (const stage of STAGES.slice(0, STAGES.indexOf(reopensAt(what))))
				expect(stageLock(stage, what)).toBeNull();
		}
	});

	test('stageLocks lists every kind of work; editLocks keeps its two reasons word for word', () => {
		expect(Object.keys(stageLocks('published')).sort()).toEqual([...LOCKABLE].sort());
		expect(editLocks('locked')).toEqual({
			cut: 'The picture is locked, so the cut is final: its length, its approved version and its review. A producer can move it back to Edit to change it.',
			chapters: null
		});
		expect(editLocks('published')).toEqual({
			cut: 'This episode is published: its chapters are in the live description and the cut is final. A producer can move it back to Edit to change it.',
			chapters:
				'This episode is published: its chapters are in the live description and the cut is final. A producer can move it back to Locked to change it.'
		});
		expect(editLocks('edit')).toEqual({ cut: null, chapters: null });
	});
});
