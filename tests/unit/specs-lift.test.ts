import { describe, expect, test } from 'vitest';
import { LIFT_CAUTION, LIFT_METHODS, liftSummary, SpecError, SUSPENSION_TYPES } from '$lib/specs';
import type { LiftInput } from '$lib/specs';

// Fictional project vehicle: a 2004 midsize pickup, coil-sprung front, leaf-sprung rear.
const midsizePickup = { frontSuspension: 'coil', rearSuspension: 'leaf' } as const;

function notesFor(input: LiftInput) {
	return liftSummary(input).notes;
}

describe('liftSummary: rake and metric equivalents', () => {
	test('rake is rear minus front, in inches and millimetres', () => {
		// 3 − 2.1 = 0.9 in; 0.9 × 25.4 = 22.86 mm (NIST SP 811 B.8: 1 in = 25.4 mm exactly).
		const summary = liftSummary({
			...midsizePickup,
			frontLiftIn: 2.1,
			rearLiftIn: 3,
			method: { front: 'coil-spacer', rear: 'add-a-leaf' }
		});
		expect(summary.rakeChangeIn).toBe(0.9);
		expect(summary.rakeChangeMm).toBeCloseTo(22.86, 9);
		// 2.1 × 25.4 = 53.34 mm; 3 × 25.4 = 76.2 mm.
		expect(summary.frontLiftMm).toBeCloseTo(53.34, 9);
		expect(summary.rearLiftMm).toBeCloseTo(76.2, 9);
	});

	test('a levelling lift at the front only gives negative rake', () => {
		const summary = liftSummary({
			...midsizePickup,
			frontLiftIn: 2,
			rearLiftIn: 0,
			method: 'coil-spacer'
		});
		expect(summary.rakeChangeIn).toBe(-2);
		expect(summary.methods).toEqual({ front: 'coil-spacer', rear: null });
	});
});

describe('liftSummary: fitment notes (common practice)', () => {
	test('a lift block on a front axle warns', () => {
		// Common practice: a lift block belongs between a leaf spring and the axle on a rear leaf-sprung axle, never the front.
		const notes = notesFor({
			frontSuspension: 'leaf',
			rearSuspension: 'leaf',
			frontLiftIn: 2,
			rearLiftIn: 2,
			method: 'lift-block'
		});
		const warning = notes.find((note) => note.id === 'block-on-front-axle');
		expect(warning).toMatchObject({
			axle: 'front',
			severity: 'warning',
			source: 'common practice'
		});
		expect(warning?.text).toMatch(/never goes on a front axle/);
		expect(notes.filter((note) => note.severity === 'warning' && note.axle === 'rear')).toEqual([]);
	});

	test('a lift block on a coil-sprung rear axle warns', () => {
		const notes = notesFor({
			frontSuspension: 'coil',
			rearSuspension: 'coil',
			frontLiftIn: 0,
			rearLiftIn: 2,
			method: 'lift-block'
		});
		expect(notes).toContainEqual(
			expect.objectContaining({ id: 'method-does-not-fit', axle: 'rear', severity: 'warning' })
		);
		expect(notes.find((note) => note.id === 'method-does-not-fit')?.text).toMatch(/leaf spring/);
	});

	test('a lift block on a leaf-sprung rear axle is fine', () => {
		const notes = notesFor({
			...midsizePickup,
			frontLiftIn: 0,
			rearLiftIn: 2,
			method: 'lift-block'
		});
		expect(notes.filter((note) => note.severity === 'warning')).toEqual([]);
	});

	test('a spacer lift notes no added travel', () => {
		// Common practice: a spacer raises ride height but adds no suspension travel.
		const notes = notesFor({
			...midsizePickup,
			frontLiftIn: 1.5,
			rearLiftIn: 0,
			method: 'coil-spacer'
		});
		const travel = notes.find((note) => note.id === 'no-added-travel');
		expect(travel).toMatchObject({ axle: 'front', severity: 'info', source: 'common practice' });
		expect(travel?.text).toMatch(/raises ride height but adds no suspension travel/);
	});

	test('strut spacers and torsion keys also note no added travel; replacement springs do not', () => {
		expect(
			notesFor({
				frontSuspension: 'strut',
				rearSuspension: 'leaf',
				frontLiftIn: 2,
				rearLiftIn: 0,
				method: 'strut-spacer'
			}).map((note) => note.id)
		).toContain('no-added-travel');
		expect(
			notesFor({
				frontSuspension: 'torsion',
				rearSuspension: 'leaf',
				frontLiftIn: 2,
				rearLiftIn: 0,
				method: 'torsion-key'
			}).map((note) => note.id)
		).toContain('no-added-travel');
		expect(
			notesFor({
				...midsizePickup,
				frontLiftIn: 2,
				rearLiftIn: 0,
				method: 'replacement-springs'
			}).map((note) => note.id)
		).not.toContain('no-added-travel');
	});

	test('past 2 in of lift, the brake line, driveshaft and steering checks appear', () => {
		// Common practice: past about two inches check brake line length, driveshaft angles, steering geometry; consider taller tyres.
		const checks = notesFor({
			...midsizePickup,
			frontLiftIn: 2.5,
			rearLiftIn: 1,
			method: { front: 'coil-spacer', rear: 'add-a-leaf' }
		}).find((note) => note.id === 'over-two-inches-checks');
		expect(checks).toMatchObject({ axle: 'front', severity: 'check', source: 'common practice' });
		expect(checks?.text).toMatch(/brake line/);
		expect(checks?.text).toMatch(/driveshaft angles/);
		expect(checks?.text).toMatch(/steering geometry/);
		expect(checks?.text).toMatch(/taller tyres/);
	});

	test('at exactly 2 in the checks note does not appear', () => {
		const ids = notesFor({
			...midsizePickup,
			frontLiftIn: 2,
			rearLiftIn: 2,
			method: { front: 'coil-spacer', rear: 'lift-block' }
		}).map((note) => note.id);
		expect(ids).not.toContain('over-two-inches-checks');
	});

	test('a method made for another suspension warns on that axle', () => {
		const notes = notesFor({
			...midsizePickup,
			frontLiftIn: 2,
			rearLiftIn: 2,
			method: 'add-a-leaf'
		});
		expect(notes).toContainEqual(
			expect.objectContaining({ id: 'method-does-not-fit', axle: 'front', severity: 'warning' })
		);
		expect(
			notes.filter((note) => note.id === 'method-does-not-fit' && note.axle === 'rear')
		).toEqual([]);
	});

	test('every note is marked common practice, and warnings come first', () => {
		for (const method of LIFT_METHODS) {
			for (const frontSuspension of SUSPENSION_TYPES) {
				const notes = notesFor({
					frontSuspension,
					rearSuspension: 'leaf',
					frontLiftIn: 3,
					rearLiftIn: 1,
					method
				});
				expect(notes.every((note) => note.source === 'common practice')).toBe(true);
				const order = notes.map((note) => ({ warning: 0, check: 1, info: 2 })[note.severity]);
				expect(order).toEqual([...order].sort((a, b) => a - b));
			}
		}
	});
});

describe('liftSummary: cautions and refusals', () => {
	test('every lift result carries the local-laws and licensed-professional caution', () => {
		const summary = liftSummary({
			...midsizePickup,
			frontLiftIn: 1,
			rearLiftIn: 0,
			method: 'coil-spacer'
		});
		expect(summary.cautions).toContain(LIFT_CAUTION);
		expect(LIFT_CAUTION).toMatch(/local laws on vehicle height, lighting and bumper height/);
		expect(LIFT_CAUTION).toMatch(/inspected by a licensed professional/);
	});

	test.each([
		[{ frontLiftIn: -1, rearLiftIn: 0 }, /cannot be negative/],
		[{ frontLiftIn: 0, rearLiftIn: 0 }, /Enter a lift/],
		[{ frontLiftIn: Number.NaN, rearLiftIn: 1 }, /as a number/],
		[{ frontLiftIn: 20, rearLiftIn: 1 }, /more than 12 in/]
	])('%o is refused with a SpecError', (lifts, message) => {
		expect(() => liftSummary({ ...midsizePickup, ...lifts, method: 'coil-spacer' })).toThrow(
			SpecError
		);
		expect(() => liftSummary({ ...midsizePickup, ...lifts, method: 'coil-spacer' })).toThrow(
			message
		);
	});

	test('a lifted axle without a method, or an unknown method or suspension, is refused', () => {
		expect(() =>
			liftSummary({
				...midsizePickup,
				frontLiftIn: 2,
				rearLiftIn: 2,
				method: { front: 'coil-spacer' }
			})
		).toThrow(/how the rear is lifted/);
		expect(() =>
			liftSummary({
				...midsizePickup,
				frontLiftIn: 2,
				rearLiftIn: 0,
				method: 'jack-stands' as 'coil-spacer'
			})
		).toThrow(SpecError);
		expect(() =>
			liftSummary({
				frontSuspension: 'air' as 'coil',
				rearSuspension: 'leaf',
				frontLiftIn: 2,
				rearLiftIn: 0,
				method: 'coil-spacer'
			})
		).toThrow(SpecError);
	});
});
