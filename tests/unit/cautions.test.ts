import { describe, expect, test } from 'vitest';
import {
	CAUTION_MAX_CHARACTERS,
	GENERAL_SAFETY_NOTE,
	HAZARDS,
	HAZARD_IDS,
	LIFT_LAW_NOTE,
	hazardById,
	isHazardId
} from '../../src/lib/cautions.ts';

// The precautions themselves are common practice in workshop safety (and in the
// service manuals and tool instructions that carry them); the 140-character
// limit and the wording are our own. The checks below look for the precaution
// each card must carry, not for our exact sentences.

describe('HAZARDS', () => {
	test('is the fixed list of nine hazards, in order', () => {
		expect(HAZARDS.map((hazard) => hazard.id)).toEqual([
			'raised-vehicle',
			'compressed-springs',
			'heat-torch',
			'cutting-grinding',
			'brakes',
			'steering',
			'airbags-electrical',
			'tyre-inflation',
			'road-test'
		]);
		expect(HAZARDS.map((hazard) => hazard.id)).toEqual([...HAZARD_IDS]);
	});

	test('ids are unique', () => {
		expect(new Set(HAZARDS.map((hazard) => hazard.id)).size).toBe(HAZARDS.length);
	});

	test.each(HAZARDS.map((hazard) => [hazard.id, hazard] as const))(
		'%s has a label and a caution that fits on screen',
		(_id, hazard) => {
			expect(hazard.label.trim().length).toBeGreaterThan(0);
			expect(hazard.defaultCaution.trim().length).toBeGreaterThan(20);
			expect(hazard.defaultCaution.length).toBeLessThanOrEqual(CAUTION_MAX_CHARACTERS);
			// Plain sentences: ends with a full stop, no doubled spaces.
			expect(hazard.defaultCaution).toMatch(/\.$/);
			expect(hazard.defaultCaution).not.toMatch(/ {2}/);
		}
	);

	test('the on-screen limit is 140 characters (our own)', () => {
		expect(CAUTION_MAX_CHARACTERS).toBe(140);
	});

	test("each caution carries its hazard's usual precaution (common practice)", () => {
		const caution = (id: (typeof HAZARD_IDS)[number]) =>
			hazardById(id).defaultCaution.toLowerCase();
		expect(caution('raised-vehicle')).toMatch(/jack stands/);
		expect(caution('raised-vehicle')).toMatch(/level ground/);
		expect(caution('raised-vehicle')).toMatch(/never work under a vehicle held up only by a jack/);
		expect(caution('compressed-springs')).toMatch(/spring compressor/);
		expect(caution('compressed-springs')).toMatch(/never remove a strut top nut/);
		expect(caution('heat-torch')).toMatch(/fire extinguisher/);
		expect(caution('cutting-grinding')).toMatch(/eye/);
		expect(caution('brakes')).toMatch(/inspected by a licensed professional before/);
		expect(caution('steering')).toMatch(/inspected by a licensed professional before/);
		expect(caution('airbags-electrical')).toMatch(/disconnect the battery/);
		expect(caution('airbags-electrical')).toMatch(/manufacturer's instructions/);
		// Bead seating: a cage and a clip-on chuck, and the tyre's printed maximum seating pressure (common practice).
		expect(caution('tyre-inflation')).toMatch(/tyre cage/);
		expect(caution('tyre-inflation')).toMatch(/seating pressure printed on the tyre/);
		expect(caution('road-test')).toMatch(/check wheels, brakes and steering before driving/);
		expect(caution('road-test')).toMatch(/where the law allows/);
	});

	test('the list cannot be edited in place', () => {
		expect(Object.isFrozen(HAZARDS)).toBe(true);
		for (const hazard of HAZARDS) expect(Object.isFrozen(hazard)).toBe(true);
	});
});

describe('hazardById and isHazardId', () => {
	test('every id finds its own hazard', () => {
		for (const hazard of HAZARDS) expect(hazardById(hazard.id)).toBe(hazard);
	});

	test('unknown strings are not hazard ids', () => {
		expect(hazardById('welding')).toBeUndefined();
		expect(isHazardId('welding')).toBe(false);
		expect(isHazardId('')).toBe(false);
		expect(isHazardId('Brakes')).toBe(false);
		expect(isHazardId(undefined)).toBe(false);
		expect(isHazardId(3)).toBe(false);
		// Inherited object keys must not pass as ids.
		expect(isHazardId('toString')).toBe(false);
		expect(isHazardId('constructor')).toBe(false);
	});

	test('every listed id passes the guard', () => {
		for (const id of HAZARD_IDS) expect(isHazardId(id)).toBe(true);
	});
});

describe('GENERAL_SAFETY_NOTE', () => {
	// The project's rule for hazardous work: show the usual cautions and defer to
	// manufacturer instructions, local codes and licensed professionals.
	const note = GENERAL_SAFETY_NOTE.toLowerCase();

	test('defers to manufacturer instructions', () => {
		expect(note).toMatch(/manufacturer's instructions/);
	});

	test('defers to local codes and laws', () => {
		expect(note).toMatch(/local codes/);
		expect(note).toMatch(/laws/);
	});

	test('defers to licensed professionals', () => {
		expect(note).toMatch(/licensed professional/);
	});

	test('says the video is general information', () => {
		expect(note).toMatch(/general information/);
	});
});

describe('LIFT_LAW_NOTE', () => {
	test('asks viewers to check local laws on lift height, lighting and bumper height', () => {
		const note = LIFT_LAW_NOTE.toLowerCase();
		expect(note).toMatch(/local laws/);
		expect(note).toMatch(/lift height/);
		expect(note).toMatch(/lighting/);
		expect(note).toMatch(/bumper height/);
	});
});
