/** Grouping a day's cautions: each distinct line once, with every segment it applies to, in rundown order. */
import { expect, test } from 'vitest';
import { dayCautions } from '../../src/lib/shoot/day-cautions';
import { hazardById } from '../../src/lib/cautions';

test('identical caution lines are listed once with their segments; flagged segments without lines get the default caution', () => {
	const stands = 'Use rated jack stands on solid, level ground.';
	const grouped = dayCautions([
		{
			position: 2,
			title: 'Jack and stands',
			hazards: ['raised-vehicle'],
			cautions: [{ hazard: 'raised-vehicle', text: stands }]
		},
		{
			position: 5,
			title: 'New U-bolts',
			hazards: ['raised-vehicle'],
			cautions: [{ hazard: 'raised-vehicle', text: stands }]
		},
		{ position: 6, title: 'Brake hose', hazards: ['brakes'], cautions: [] },
		{ position: 7, title: 'Road test', hazards: [], cautions: [] }
	]);
	expect(grouped).toEqual([
		{
			text: stands,
			segments: [
				{ position: 2, title: 'Jack and stands' },
				{ position: 5, title: 'New U-bolts' }
			]
		},
		{ text: hazardById('brakes')!.defaultCaution, segments: [{ position: 6, title: 'Brake hose' }] }
	]);
});
