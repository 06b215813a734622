import { describe, expect, test } from 'vitest';
import {
	LIFT_CAUTION,
	parseTyreSize,
	renderSpecCard,
	SpecError,
	specCardInputSchema,
	TORQUE_CAUTION
} from '$lib/specs';
import type { SpecCard, SpecCardInput } from '$lib/specs';

function line(card: SpecCard, label: string) {
	const found = card.lines.find((candidate) => candidate.label === label);
	if (!found) throw new Error(`no line labelled ${label}`);
	return found;
}

describe('renderSpecCard: tyre', () => {
	test('285/70R17 reads 32.7 in / 831 mm tall', () => {
		// tests/REFERENCES.md, "Tyres", worked example: 32.71 in → 0.1 in: 32.7; 830.8 mm → whole mm: 831.
		const card = renderSpecCard({ kind: 'tyre', size: '285/70r17' });
		expect(card.heading).toBe('285/70R17');
		expect(line(card, 'Overall diameter')).toEqual({
			label: 'Overall diameter',
			imperial: '32.7 in',
			metric: '831 mm'
		});
		// 285 mm ÷ 25.4 = 11.22 in; 199.5 mm sidewall ÷ 25.4 = 7.85 in → 7.9 in, 200 mm (an exact tie: toFixed picks the larger, 200).
		expect(line(card, 'Section width')).toMatchObject({ imperial: '11.2 in', metric: '285 mm' });
		expect(line(card, 'Sidewall height')).toMatchObject({ imperial: '7.9 in', metric: '200 mm' });
		// Revolutions: 63,360 ÷ 102.757 = 616.6 → 617 per mile; 10⁶ ÷ 2610.035 = 383.1 → 383 per km.
		expect(line(card, 'Revolutions')).toMatchObject({
			imperial: '617 per mile',
			metric: '383 per km'
		});
		expect(card.cautions.join(' ')).toMatch(/under load/);
	});

	test('225/70R15 reads 27.4 in / 696 mm (handbook tyre arithmetic)', () => {
		expect(
			line(renderSpecCard({ kind: 'tyre', size: '225/70R15' }), 'Overall diameter')
		).toMatchObject({ imperial: '27.4 in', metric: '696 mm' });
	});

	test('an invalid size throws SpecError with the parser’s own message', () => {
		let parserMessage = '';
		try {
			parseTyreSize('285/70');
		} catch (error) {
			parserMessage = (error as Error).message;
		}
		expect(parserMessage).not.toBe('');
		expect(() => renderSpecCard({ kind: 'tyre', size: '285/70' })).toThrow(SpecError);
		expect(() => renderSpecCard({ kind: 'tyre', size: '285/70' })).toThrow(parserMessage);
	});
});

describe('renderSpecCard: tyre change', () => {
	test('265/70R17 → 285/70R17 shows the hand-worked change', () => {
		const card = renderSpecCard({ kind: 'tyre-change', from: '265/70R17', to: '285/70R17' });
		expect(card.heading).toBe('265/70R17 → 285/70R17');
		// 28 mm = 1.10 in diameter change; half of it, 14 mm = 0.55 in, under the axle (common practice).
		expect(line(card, 'Diameter change')).toMatchObject({ imperial: '+1.1 in', metric: '+28 mm' });
		expect(line(card, 'Axle height change (half the diameter change)')).toMatchObject({
			imperial: '+0.55 in',
			metric: '+14 mm'
		});
		// 60 × 830.8 ÷ 802.8 = 62.09 mph; 100 × 830.8 ÷ 802.8 = 103.49 km/h.
		expect(line(card, 'True speed at an indicated 60 mph / 100 km/h')).toMatchObject({
			imperial: '62.1 mph',
			metric: '103.5 km/h'
		});
		// 616.60 − 638.10 = −21.5 → −22 per mile; 383.14 − 396.50 = −13.4 → −13 per km.
		expect(line(card, 'Revolutions change')).toMatchObject({
			imperial: '-22 per mile',
			metric: '-13 per km'
		});
		expect(card.cautions.join(' ')).toMatch(/read low/);
	});
});

describe('renderSpecCard: torque', () => {
	test('every torque card carries the manufacturer caution, whatever the unit', () => {
		for (const unit of ['ft·lbf', 'N·m', 'in·lbf'] as const) {
			const card = renderSpecCard({ kind: 'torque', value: 95, unit });
			expect(card.cautions).toContain("Verify against the manufacturer's instructions.");
			expect(card.cautions).toContain(TORQUE_CAUTION);
		}
	});

	test('lug nuts at 95 ft·lbf read 95 ft·lbf / 129 N·m under the fastener name', () => {
		// NIST SP 811 B.8: 95 × 1.355818 = 128.80 N·m → 129.
		const card = renderSpecCard({
			kind: 'torque',
			value: 95,
			unit: 'ft·lbf',
			fastener: 'Lug nuts (fictional 6-lug wheel)'
		});
		expect(card.heading).toBe('Lug nuts (fictional 6-lug wheel)');
		expect(card.lines).toEqual([{ label: 'Torque', imperial: '95 ft·lbf', metric: '129 N·m' }]);
	});

	test('a zero torque throws SpecError', () => {
		expect(() => renderSpecCard({ kind: 'torque', value: 0, unit: 'N·m' })).toThrow(SpecError);
	});
});

describe('renderSpecCard: lift', () => {
	const liftInput: SpecCardInput = {
		kind: 'lift',
		frontLiftIn: 2.5,
		rearLiftIn: 3,
		frontSuspension: 'coil',
		rearSuspension: 'leaf',
		method: { front: 'coil-spacer', rear: 'lift-block' }
	};

	test('lift cards carry the local-laws / licensed-professional caution', () => {
		expect(renderSpecCard(liftInput).cautions).toContain(LIFT_CAUTION);
	});

	test('lift lines show stated inches, whole millimetres and signed rake', () => {
		// 2.5 × 25.4 = 63.5 → 64 mm; 3 × 25.4 = 76.2 → 76 mm; rake 3 − 2.5 = +0.5 in = +12.7 → +13 mm.
		const card = renderSpecCard(liftInput);
		expect(card.heading).toBe('Lift: coil spacer front, lift block rear');
		expect(line(card, 'Front lift')).toMatchObject({ imperial: '2.5 in', metric: '64 mm' });
		expect(line(card, 'Rear lift')).toMatchObject({ imperial: '3 in', metric: '76 mm' });
		expect(line(card, 'Rake change (rear minus front)')).toMatchObject({
			imperial: '+0.5 in',
			metric: '+13 mm'
		});
		expect(card.cautions.join(' ')).toMatch(/brake line length/);
	});

	test('a block on the front shows its warning on the card', () => {
		const card = renderSpecCard({
			...liftInput,
			frontSuspension: 'leaf',
			method: 'lift-block'
		} as SpecCardInput);
		expect(card.cautions[0]).toMatch(/never goes on a front axle/);
	});
});

describe('renderSpecCard: text and shapes', () => {
	test('a text card keeps its heading and body', () => {
		const card = renderSpecCard({
			kind: 'text',
			heading: '  Next week  ',
			body: 'Bolting on a 3 in coil spacer kit.'
		});
		expect(card).toEqual({
			kind: 'text',
			heading: 'Next week',
			lines: [],
			cautions: [],
			body: 'Bolting on a 3 in coil spacer kit.'
		});
	});

	test('specCardInputSchema accepts each kind and rejects bad shapes', () => {
		expect(specCardInputSchema.safeParse({ kind: 'tyre', size: '35x12.50R17' }).success).toBe(true);
		expect(specCardInputSchema.safeParse({ kind: 'torque', value: 95, unit: 'N·m' }).success).toBe(
			true
		);
		expect(
			specCardInputSchema.safeParse({ kind: 'torque', value: '95', unit: 'N·m' }).success
		).toBe(false);
		expect(specCardInputSchema.safeParse({ kind: 'torque', value: 95, unit: 'kg·m' }).success).toBe(
			false
		);
		expect(specCardInputSchema.safeParse({ kind: 'spinner' }).success).toBe(false);
		expect(
			specCardInputSchema.safeParse({ kind: 'text', heading: 'x'.repeat(61), body: 'y' }).success
		).toBe(false);
		expect(
			specCardInputSchema.safeParse({
				kind: 'lift',
				frontLiftIn: 1,
				rearLiftIn: 0,
				frontSuspension: 'coil',
				rearSuspension: 'leaf',
				method: 'coil-spacer'
			}).success
		).toBe(true);
	});

	test('a badly shaped input throws SpecError in plain words', () => {
		expect(() => renderSpecCard({ kind: 'spinner' } as unknown as SpecCardInput)).toThrow(
			/Choose a card kind/
		);
		expect(() =>
			renderSpecCard({ kind: 'torque', value: '95', unit: 'N·m' } as unknown as SpecCardInput)
		).toThrow(SpecError);
		expect(() => renderSpecCard({ kind: 'tyre', size: '' })).toThrow(/Enter a tyre size/);
	});
});
