/**
 * The paragraph a host reads aloud to measure their speaking pace (the Pace page). Plain workshop
 * prose with a figure and a unit in it, as scripts have. Its spoken-word count is fixed here so the
 * browser needs no Markdown reader; tests/unit/pace-sample.test.ts checks it against
 * countSpokenWords.
 */
export const PACE_SAMPLE = [
	'Before we lift anything, the truck goes on flat, solid ground with the wheels chocked.',
	'Crack the lug nuts loose while the tyre still carries the weight, then raise the corner',
	'and set a stand under the frame rail. Never work under a vehicle held up by the jack alone.',
	'Once the wheel is off, look over the brake hose, the ball joint and the sway bar link.',
	'Clean threads go back together at the torque the manufacturer lists, around 95 ft-lbs on a',
	'pickup like this one, and we check it again after the first fifty miles.'
].join(' ');

/** Spoken words in PACE_SAMPLE ("95 ft-lbs" is four: "ninety-five foot pounds"). */
export const PACE_SAMPLE_WORDS = 100;
