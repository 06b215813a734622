/**
 * Demo rundowns, scripts, cautions, shots and takes, script reviews, stage history and follow-ups
 * for the demo episodes. Each episode's data matches its stage: the published and edit-stage
 * episodes passed their gates on the way (approved scripts, shots with good takes and footage),
 * the edit-stage one still has one caution to place, the script-stage one was returned with
 * comments, and the shoot-stage one is missing a take and an upload. The episodes with a cut have
 * their segments' in and out points on the timeline (demoSpans), and every caution card is shown
 * inside its segment for its reading time and a second more. All names are invented.
 */
import { createHash, randomUUID } from 'node:crypto';
import { sql, type Transaction } from 'kysely';
import type { Database } from '../../src/lib/server/db/types.ts';
import { hazardById, type HazardId } from '../../src/lib/cautions.ts';
import type { SegmentKind } from '../../src/lib/rundown.ts';
import type { Stage } from '../../src/lib/stages.ts';
import { countSpokenWords } from '../../src/lib/script/timing.ts';
import { readingSeconds } from '../../src/lib/reading-time.ts';
import {
	framesToSeconds,
	parseTimecode,
	secondsToFrames,
	type FrameRate
} from '../../src/lib/timecode.ts';
import { scriptFingerprint } from '../../src/lib/server/episodes/fingerprint.ts';
import type { SeedContext } from './seed-context.ts';

type TakeSeed = [
	clip: string,
	sourceIn: string,
	sourceOut: string,
	good: boolean,
	withFootage: boolean,
	note?: string
];

interface ShotSeed {
	what: string;
	angle: string;
	roll: 'A' | 'B';
	camera: string;
	notes?: string;
	takes?: TakeSeed[];
}

interface SegmentSeed {
	kind: SegmentKind;
	title: string;
	planned: number;
	build?: string;
	needsFootage?: boolean;
	hazards?: HazardId[];
	script: string;
	/** Length in the cut: a clock time, or 'spoken' to work it out from the words at the host's real pace. */
	recorded?: string | 'spoken';
	/** Per hazard: where the card sits in the cut (timecode at the episode's rate) and any rewording. */
	cautions?: Partial<Record<HazardId, { at?: string; text?: string }>>;
	shots?: ShotSeed[];
	promise?: { slug?: string; title?: string };
}

interface ReviewSeed {
	kind: 'submitted' | 'approved' | 'returned' | 'comment';
	by: string;
	daysAgo: number;
	body?: string;
	/** One-based segment number for a comment on one segment. */
	segment?: number;
}

interface EpisodeWorkSeed {
	scriptStatus: 'draft' | 'submitted' | 'approved' | 'returned';
	history: { to: Stage; by: string; daysAgo: number; note?: string }[];
	reviews: ReviewSeed[];
	segments: SegmentSeed[];
}

const dana = 'dana@torquehaven.test';
const rico = 'rico@torquehaven.test';
const mika = 'mika@torquehaven.test';
const jules = 'jules@cutbench.test';
const sam = 'sam@dunewagon.test';

/** Rico's real pace on camera, for the recorded lengths worked out from words (his pace calibrates from these). */
const RICO_RECORDED_WPM = 146;

const work: Record<string, EpisodeWorkSeed> = {
	'mule-rear-block-lift': {
		scriptStatus: 'approved',
		history: [
			{ to: 'script', by: dana, daysAgo: 32, note: 'Episode created' },
			{
				to: 'shoot',
				by: rico,
				daysAgo: 15,
				note: 'Script approved, shot list planned with Mika. Bay 3 booked for Saturday.'
			},
			{
				to: 'edit',
				by: mika,
				daysAgo: 7,
				note: 'All rushes uploaded. B-cam clips are the C-numbered ones.'
			}
		],
		reviews: [
			{ kind: 'submitted', by: rico, daysAgo: 19 },
			{
				kind: 'returned',
				by: dana,
				daysAgo: 18,
				body: 'Segment 4 spends a minute on pinion angle maths. Keep one sentence and let the angle finder show it.'
			},
			{ kind: 'submitted', by: rico, daysAgo: 17 },
			{
				kind: 'comment',
				by: dana,
				daysAgo: 16,
				segment: 6,
				body: 'Say the brake hose check out loud: people skip it, and a stretched hose is how this goes wrong.'
			},
			{ kind: 'approved', by: dana, daysAgo: 16, body: 'Good to shoot.' }
		],
		segments: [
			{
				kind: 'cold-open',
				title: 'Why Mule sits nose-high',
				planned: 50,
				build: 'mule',
				script:
					'[[A-roll: Mule side-on in the lot, camper hitched]]\n\nHook up a camper to **Project Mule** and the tail drops like it’s apologising. Today we fix that: a tapered three-inch block, longer U-bolts and matched shocks, in one afternoon in Bay 3.\n\n[[B-roll: tape measure at the rear arch, then the front]]\n\nBy the end, Mule sits level loaded, and you’ll know exactly which numbers to check on your own truck.',
				shots: [
					{
						what: 'Mule side-on, camper hitched, tail down',
						angle: 'Wide, low',
						roll: 'A',
						camera: 'A-cam',
						takes: [['ACAM_1001', '09:02:10:00', '09:02:41:12', true, true]]
					},
					{
						what: 'Tape measure at rear and front arch',
						angle: 'Close-up',
						roll: 'B',
						camera: 'B-cam',
						takes: [
							['BCAM_1002', '09:05:00:00', '09:05:20:00', false, true, 'Focus hunted'],
							['BCAM_1003', '09:05:30:00', '09:05:52:04', true, true]
						]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'Chocks, jack and stands',
				planned: 80,
				build: 'mule',
				hazards: ['raised-vehicle'],
				cautions: { 'raised-vehicle': { at: '00:00:55;00' } },
				script:
					'Before a single bolt turns: **chocks on the front wheels**, jack under the rear axle, and stands under the frame rails, not the axle, because the axle is about to move.\n\nLower the truck onto the stands, then give it a firm shove. If it moves, start again.\n\n[[B-roll: stand pin going in, ratchet clicks]]',
				shots: [
					{
						what: 'Chocks on the front wheels',
						angle: 'Medium',
						roll: 'B',
						camera: 'B-cam',
						takes: [['BCAM_2001', '09:20:00:00', '09:20:12:00', true, true]]
					},
					{
						what: 'Stands under the frame rails, shove test',
						angle: 'Wide, low',
						roll: 'A',
						camera: 'A-cam',
						takes: [['ACAM_2004', '09:22:00:00', '09:23:10:00', true, true]]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'Support the axle, off with the U-bolts',
				planned: 110,
				build: 'mule',
				hazards: ['raised-vehicle', 'cutting-grinding'],
				cautions: {
					'raised-vehicle': { at: '00:02:12;00' },
					'cutting-grinding': {
						at: '00:03:05;00',
						text: 'Seized U-bolts get cut, not fought: eye, ear and hand protection on, and sparks pointed away from the fuel tank.'
					}
				},
				script:
					'The jack stays under the axle, just taking the weight. Now the U-bolts. Ours have twenty years of road salt on them, so two came off with a breaker bar and **two got cut**.\n\n[[B-roll: grinder sparks, close, then wide]]\n\nNever reuse a U-bolt. They stretch when they’re torqued, and a stretched one won’t hold its clamp load again.',
				shots: [
					{
						what: 'Breaker bar on the U-bolt nuts',
						angle: 'Close-up',
						roll: 'A',
						camera: 'A-cam',
						takes: [['ACAM_3001', '10:01:00:00', '10:02:30:00', true, true]]
					},
					{
						what: 'Cutting the seized U-bolt',
						angle: 'Close, then wide',
						roll: 'B',
						camera: 'B-cam',
						notes: 'Shield between grinder and camera',
						takes: [['BCAM_3002', '10:05:00:00', '10:05:45:00', true, true]]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'Tapered block in, pinion angle checked',
				planned: 150,
				build: 'mule',
				hazards: ['raised-vehicle'],
				cautions: { 'raised-vehicle': { at: '00:04:07;00' } },
				script:
					'Lower the axle just enough to slide the block in. It’s **tapered two degrees**, thick end to the back, so the pinion points back up at the transfer case instead of at the ground.\n\n[[Spec card: lift 3 in rear, 2 in front strut spacers]]\n\nAngle finder on the pinion flange: we’re within a degree of the driveshaft. That’s the one sentence of maths today.\n\n- Centre pin in the block’s hole\n- Block’s pin in the axle perch\n- Thick end towards the rear',
				shots: [
					{
						what: 'Block sliding onto the perch',
						angle: 'Close-up',
						roll: 'A',
						camera: 'A-cam',
						takes: [['ACAM_4002', '10:40:00:00', '10:41:20:00', true, true]]
					},
					{
						what: 'Angle finder on the pinion flange',
						angle: 'Insert',
						roll: 'B',
						camera: 'B-cam',
						takes: [['BCAM_4001', '10:45:00:00', '10:45:18:00', true, true]]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'New U-bolts, torqued in a cross pattern',
				planned: 140,
				build: 'mule',
				hazards: ['raised-vehicle'],
				cautions: { 'raised-vehicle': { at: '00:06:42;00' } },
				script:
					'New **5/8 by 11 inch** U-bolts, snugged by hand first. Then torque in a cross pattern, like wheel nuts, in three passes. Check the number in your kit’s instructions; ours is on the card.\n\n[[Spec card: torque, from the kit sheet]]\n\nAnd put a note in your phone: **re-torque after 50 miles**. The block and the spring settle.',
				shots: [
					{
						what: 'Cross-pattern torque passes',
						angle: 'Medium',
						roll: 'A',
						camera: 'A-cam',
						takes: [['ACAM_5003', '11:10:00:00', '11:12:05:00', true, true]]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'Matched rear shocks and the brake hose',
				planned: 140,
				build: 'mule',
				hazards: ['raised-vehicle', 'brakes'],
				cautions: { 'raised-vehicle': { at: '00:09:07;00' } },
				script:
					'Three inches taller means the old shocks top out. The new ones are sized for the lift.\n\nNow the bit people skip: **let the axle hang to full droop and look at the brake hose**. If it’s tight, it needs the longer hose before this truck moves.\n\n[[B-roll: hose at full droop, finger showing the slack]]',
				shots: [
					{
						what: 'Shock swap, both sides',
						angle: 'Medium',
						roll: 'A',
						camera: 'A-cam',
						takes: [['ACAM_6001', '11:40:00:00', '11:43:00:00', true, true]]
					},
					{
						what: 'Brake hose at full droop',
						angle: 'Close-up',
						roll: 'B',
						camera: 'B-cam',
						takes: [['BCAM_6002', '11:50:00:00', '11:50:25:00', true, true]]
					}
				]
			},
			{
				kind: 'test-drive',
				title: 'Road test with the camper',
				planned: 80,
				build: 'mule',
				script:
					'Camper back on, same tape measure: the rear sits a touch higher than the front, which is where you want it with a load. It drives flat, no bump-steer, no clunks.\n\n[[A-roll: in-cab, then tracking shot from the chase car]]',
				shots: [
					{
						what: 'Tracking shot with camper',
						angle: 'Chase car',
						roll: 'B',
						camera: 'B-cam',
						takes: [['BCAM_7001', '14:00:00:00', '14:01:30:00', true, true]]
					}
				]
			},
			{
				kind: 'call-to-action',
				title: 'What it cost',
				planned: 30,
				needsFootage: false,
				script:
					'Blocks, U-bolts and shocks came to just over four hundred dollars. Every part is linked below, and the torque figures are on screen, but your kit’s instructions win every time.'
			},
			{
				kind: 'teaser',
				title: 'Next time: 285s without the rub',
				planned: 20,
				needsFootage: false,
				promise: { slug: 'mule-285-tyres' },
				script:
					'Next time: now it sits level, we fit **285/70R17s**, and find out whether they rub at full lock.'
			}
		]
	},
	'mule-285-tyres': {
		scriptStatus: 'returned',
		history: [{ to: 'script', by: dana, daysAgo: 10, note: 'Episode created' }],
		reviews: [
			{ kind: 'submitted', by: rico, daysAgo: 4 },
			{
				kind: 'returned',
				by: dana,
				daysAgo: 3,
				body: 'The numbers segment reads like a spreadsheet: say the diameter once and let the spec card carry the rest. And write the full-lock check before we book the bay.'
			}
		],
		segments: [
			{
				kind: 'cold-open',
				title: 'The rub at full lock',
				planned: 25,
				build: 'mule',
				script:
					'[[A-roll: wheel at full lock, tyre kissing the liner]]\n\nThat sound? That’s a **285** touching the inner liner at full lock. Today we find out if it’s a trim job or a wrong tyre.',
				shots: [
					{
						what: 'Wheel at full lock, tyre on the liner',
						angle: 'Close, low',
						roll: 'A',
						camera: 'A-cam'
					}
				]
			},
			{
				kind: 'overview',
				title: 'What 285/70R17 means',
				planned: 70,
				build: 'mule',
				script:
					'Read the sidewall left to right: **285** millimetres wide, a sidewall **70 percent** as tall as that width, on a **17 inch** rim.\n\nMule came on 265s. The 285s are about an inch taller overall, and that one inch is what we’re checking today.',
				shots: [{ what: 'Sidewall code, slow push-in', angle: 'Macro', roll: 'B', camera: 'B-cam' }]
			},
			{
				kind: 'wheels-tyres',
				title: 'The numbers: diameter and clearance',
				planned: 90,
				build: 'mule',
				script:
					'Old tyre: 31.6 inches tall. New tyre: 32.7. That’s 1.1 inches more diameter, so the axle sits about half of that, **0.55 inches**, higher off the ground. The speedometer now reads about 3.5 percent slow: at an indicated sixty you’re doing just over sixty-two.\n\n[[Spec card: tyre change 265/70R17 → 285/70R17]]\n\n| | Old | New |\n|---|---|---|\n| Diameter | 31.6 in | 32.7 in |\n| Revs per mile | 638 | 617 |'
			},
			{
				kind: 'install-step',
				title: 'Wheels off, on stands',
				planned: 80,
				build: 'mule',
				hazards: ['raised-vehicle'],
				script:
					'Same drill as always: chocks, jack at the jacking point, **stands under the frame** before a wheel comes off. Loosen the lug nuts a half turn while the tyre is still on the ground.',
				shots: [
					{ what: 'Stands placed, lug nuts cracked', angle: 'Wide', roll: 'A', camera: 'A-cam' }
				]
			},
			{
				kind: 'wheels-tyres',
				title: 'Mount, balance and torque',
				planned: 100,
				build: 'mule',
				hazards: ['raised-vehicle'],
				script:
					'Mounted and balanced at the tyre bench. On the truck, lug nuts go on by hand, then torque in a star pattern to the figure in your owner’s manual.\n\n[[Spec card: lug nut torque]]'
			},
			{
				kind: 'wheels-tyres',
				title: 'Full-lock clearance check',
				planned: 60,
				build: 'mule',
				script: ''
			},
			{
				kind: 'test-drive',
				title: 'Speedometer check on the highway',
				planned: 60,
				build: 'mule',
				script: ''
			},
			{
				kind: 'call-to-action',
				title: 'Parts and the shop',
				planned: 25,
				needsFootage: false,
				script: 'Both tyre sizes and the wheels are in the Torquehaven shop, linked below.'
			}
		]
	},
	'tallboy-coil-spacers': {
		scriptStatus: 'approved',
		history: [
			{ to: 'script', by: dana, daysAgo: 60, note: 'Episode created' },
			{ to: 'shoot', by: rico, daysAgo: 41, note: 'Approved. Quarry booked for the trail test.' },
			{ to: 'edit', by: mika, daysAgo: 33, note: 'Rushes up, quarry footage included.' },
			{
				to: 'locked',
				by: jules,
				daysAgo: 20,
				note: 'Chapters and cautions placed; picture locked.'
			},
			{ to: 'published', by: dana, daysAgo: 14, note: 'Live.' }
		],
		reviews: [
			{ kind: 'submitted', by: rico, daysAgo: 45 },
			{
				kind: 'approved',
				by: dana,
				daysAgo: 43,
				body: 'Love the “no extra travel” line. Shoot it.'
			}
		],
		segments: [
			{
				kind: 'cold-open',
				title: 'An inch and a half, and no extra travel',
				planned: 40,
				build: 'tallboy',
				recorded: 'spoken',
				script:
					'An inch and a half of lift, front and rear, for under a hundred and fifty dollars, and you can do it in a Saturday. But here’s the thing nobody puts on the box: coil spacers give you height, not travel. Your suspension moves exactly as far as it did before, it just does it higher up. If that’s what you need, for taller tyres or a bit more clearance over rocks, stick around, because this is the cheapest, simplest lift there is.',
				shots: [
					{
						what: 'Tallboy parked at the quarry edge',
						angle: 'Wide',
						roll: 'A',
						camera: 'A-cam',
						takes: [['ACAM_101001', '08:00:00:00', '08:00:45:00', true, true]]
					}
				]
			},
			{
				kind: 'overview',
				title: 'What coil spacers do, and what they don’t',
				planned: 75,
				build: 'tallboy',
				recorded: 'spoken',
				script:
					'A coil spacer is a ring, polyurethane or aluminium, that sits on top of the spring and pushes the body up by its own thickness. Ours are one and a half inch polyurethane. They keep your factory springs, your factory ride, and your factory shocks, as long as the shocks still have some travel left at full droop. What they don’t do is add any travel, and past about two inches they start asking your shocks, sway bar links and brake lines for more length than they have. So we stay at one and a half, and we check all three.',
				shots: [
					{
						what: 'Spacer in hand, next to the spring',
						angle: 'Insert',
						roll: 'B',
						camera: 'B-cam',
						takes: [['BCAM_101002', '08:30:00:00', '08:30:40:00', true, true]]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'Supporting a coil-sprung axle',
				planned: 70,
				build: 'tallboy',
				hazards: ['raised-vehicle'],
				cautions: { 'raised-vehicle': { at: '00:01:57;00' } },
				script:
					'Stands under the frame, jack under the axle. The axle is going to drop, so the **stands are what hold the truck**. Shove test before anything else.',
				shots: [
					{
						what: 'Stands under the frame, shove test',
						angle: 'Wide',
						roll: 'A',
						camera: 'A-cam',
						takes: [['ACAM_102001', '09:00:00:00', '09:01:00:00', true, true]]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'Front: dropping the axle and fitting the spacers',
				planned: 140,
				build: 'tallboy',
				hazards: ['raised-vehicle', 'compressed-springs'],
				cautions: {
					'raised-vehicle': { at: '00:03:04;00' },
					'compressed-springs': { at: '00:03:40;00' }
				},
				script:
					'Shocks off, sway bar links off, and lower the axle slowly until the spring is **completely free**. If it’s still under load, stop and lower more. Spacer on top, spring back in, and raise the axle to seat it.',
				shots: [
					{
						what: 'Spring coming out, spacer going in',
						angle: 'Medium',
						roll: 'A',
						camera: 'A-cam',
						takes: [['ACAM_103002', '09:30:00:00', '09:33:00:00', true, true]]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'Front: sway bar links and brake line slack',
				planned: 85,
				build: 'tallboy',
				hazards: ['brakes'],
				cautions: { brakes: { at: '00:05:22;00' } },
				script:
					'At full droop, the brake lines still have slack: we checked both sides with the axle hanging. The sway bar links got the longer ones.',
				shots: [
					{
						what: 'Brake line slack at full droop',
						angle: 'Close-up',
						roll: 'B',
						camera: 'B-cam',
						takes: [['BCAM_104001', '10:00:00:00', '10:00:30:00', true, true]]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'Rear: spacers in, shock length checked',
				planned: 105,
				build: 'tallboy',
				hazards: ['raised-vehicle', 'compressed-springs'],
				cautions: {
					'raised-vehicle': { at: '00:06:50;00' },
					'compressed-springs': { at: '00:07:15;00' }
				},
				script:
					'Same again at the back. Before the shocks go back on, measure them extended against the gap at full droop: ours have **three quarters of an inch** to spare.',
				shots: [
					{
						what: 'Measuring shock length at droop',
						angle: 'Insert',
						roll: 'B',
						camera: 'B-cam',
						takes: [['BCAM_105003', '10:40:00:00', '10:41:00:00', true, true]]
					}
				]
			},
			{
				kind: 'test-drive',
				title: 'Trail test at the quarry',
				planned: 90,
				build: 'tallboy',
				script:
					'[[A-roll: quarry climb, then the ledge]]\n\nSame ledge, same line: the front bumper clears where it used to scrape.',
				shots: [
					{
						what: 'Quarry ledge climb',
						angle: 'Wide, low',
						roll: 'A',
						camera: 'A-cam',
						takes: [['ACAM_106001', '13:00:00:00', '13:02:00:00', true, true]]
					}
				]
			},
			{
				kind: 'call-to-action',
				title: 'Verdict, costs and the parts list',
				planned: 50,
				needsFootage: false,
				recorded: 'spoken',
				script:
					'So was it worth it? For a hundred and twenty-eight dollars in spacers and forty for longer sway bar links, Tallboy sits an inch and a half higher, the bumper clears that ledge, and the ride feels exactly like it did before, because nothing that moves has changed. Every part is linked in the description, and if you have questions about your own truck, the shop’s fitment desk will answer them. Subscribe so you catch the next one.'
			},
			{
				kind: 'teaser',
				title: 'Coming up: regearing Tallboy',
				planned: 20,
				needsFootage: false,
				promise: { title: 'Tallboy front axle regear' },
				script:
					'Bigger tyres are coming, and that means new gears. We’ll open up the front axle in a future episode.'
			}
		]
	},
	'sandpiper-brake-refresh': {
		scriptStatus: 'approved',
		history: [
			{ to: 'script', by: sam, daysAgo: 20, note: 'Episode created' },
			{ to: 'shoot', by: sam, daysAgo: 6, note: 'Shooting over two Saturdays.' }
		],
		reviews: [
			{ kind: 'approved', by: sam, daysAgo: 7, body: 'Self-approved: one-person crew this season.' }
		],
		segments: [
			{
				kind: 'cold-open',
				title: 'A pedal that sinks',
				planned: 30,
				build: 'sandpiper',
				script:
					'Push the pedal on Sandpiper and it sinks halfway to the floor. Forty-five-year-old lines, tired pads, and fluid the colour of tea. All of it goes today.',
				shots: [
					{
						what: 'Foot on the pedal, pedal sinking',
						angle: 'Footwell',
						roll: 'A',
						camera: 'Action cam',
						takes: [['AC01_0001', '09:00:00:00', '09:00:20:00', true, true]]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'Old lines out',
				planned: 120,
				build: 'sandpiper',
				hazards: ['raised-vehicle', 'brakes'],
				script:
					'Rail on stands, wheels off. Flare-nut wrench on every fitting, never an open-ended spanner: the old nuts are soft and they round off.\n\n[[B-roll: fluid dripping into the catch pan]]',
				shots: [
					{
						what: 'Flare-nut wrench on the front fitting',
						angle: 'Close-up',
						roll: 'A',
						camera: 'Main cam',
						takes: [['MC01_0004', '09:30:00:00', '09:31:10:00', true, true]]
					},
					{
						what: 'Fluid into the catch pan',
						angle: 'Insert',
						roll: 'B',
						camera: 'Main cam',
						takes: [
							[
								'MC01_0007',
								'09:40:00:00',
								'09:40:15:00',
								true,
								false,
								'On the card, not uploaded yet'
							]
						]
					}
				]
			},
			{
				kind: 'install-step',
				title: 'Bleed and bed the pads',
				planned: 120,
				build: 'sandpiper',
				hazards: ['brakes'],
				script:
					'Bleed from the wheel furthest from the master cylinder, and keep the reservoir topped up so it never draws air. Then bed the pads in: the procedure is in the box, follow it.',
				shots: [{ what: 'Bleeding the rear right', angle: 'Medium', roll: 'A', camera: 'Main cam' }]
			},
			{
				kind: 'install-step',
				title: 'Tie rod ends while it’s up',
				planned: 90,
				build: 'sandpiper',
				hazards: ['raised-vehicle', 'steering'],
				script:
					'While it’s on stands: the tie rod ends have play. New ones, castle nuts torqued, **new cotter pins**, and an alignment before it goes on the sand.',
				shots: [
					{
						what: 'Checking tie rod play by hand',
						angle: 'Close-up',
						roll: 'A',
						camera: 'Main cam',
						takes: [['MC02_0002', '10:20:00:00', '10:20:40:00', true, true]]
					}
				]
			},
			{
				kind: 'call-to-action',
				title: 'More rebuilds weekly',
				planned: 20,
				needsFootage: false,
				script: 'More sand-rail rebuilds every week.'
			}
		]
	}
};

const uploader = (slug: string) => (slug === 'sandpiper-brake-refresh' ? sam : mika);

/** Our demo cameras record at 100 Mbit/s; GB = Mbit/s × seconds ÷ 8 ÷ 1000 (decimal units). */
const DEMO_BITRATE_MBPS = 100;

/**
 * A footage row for a demo take, so the takes that passed the shoot gate point at footage. The demo
 * has no real files on disk, and the row says so in its probe note.
 */
async function demoFootage(
	trx: Transaction<Database>,
	input: {
		channelId: string;
		episodeId: string;
		clipName: string;
		camera: string;
		seconds: number;
		rate: FrameRate;
		uploadedBy: string;
		uploadedAt: Date;
	}
): Promise<string> {
	const row = await trx
		.insertInto('footage')
		.values({
			channelId: input.channelId,
			episodeId: input.episodeId,
			uploadId: `demo-${randomUUID()}`,
			purpose: 'footage',
			cameraLabel: input.camera,
			clipName: input.clipName,
			fileName: `${input.clipName}.mov`,
			fileType: 'video/quicktime',
			sizeBytes: Math.round((DEMO_BITRATE_MBPS * 1_000_000 * input.seconds) / 8),
			sha256: createHash('sha256').update(`demo footage ${input.clipName}`).digest('hex'),
			durationSeconds: input.seconds,
			frameRate: input.rate,
			videoCodec: null,
			probeNote: 'Demo data: this clip has no file on disk.',
			uploadedBy: input.uploadedBy,
			createdAt: input.uploadedAt
		})
		.returning('id')
		.executeTakeFirstOrThrow();
	return row.id;
}

/**
 * Where each segment sits in the cut of the episodes that have one: segment n runs from the n-th
 * cut point to the next (timecode at 29.97 drop-frame; the last point is the cut's end, as in
 * seed-edit.ts). The points follow the demo chapters, and every placed caution falls inside its
 * segment.
 */
const demoSpans: Record<string, string[]> = {
	'mule-rear-block-lift': [
		'00:00:00;00',
		'00:00:52;00',
		'00:02:10;00',
		'00:04:05;00',
		'00:06:40;00',
		'00:09:05;00',
		'00:11:30;00',
		'00:12:50;00',
		'00:13:20;00',
		'00:13:40;00'
	],
	'tallboy-coil-spacers': [
		'00:00:00;00',
		'00:00:41;00',
		'00:01:55;00',
		'00:03:02;00',
		'00:05:20;00',
		'00:06:48;00',
		'00:09:50;00',
		'00:11:20;00',
		'00:12:10;00',
		'00:12:18;00'
	]
};

/** A demo caution stays on screen for its reading time and one second more (our own margin). */
const CAUTION_MARGIN_SECONDS = 1;

/** Timecode or clock text → frames; the demo cameras record non-drop timecode, written with ':'. */
function frames(text: string, rate: FrameRate): number {
	return parseTimecode(text, rate);
}

const daysAgo = (days: number, minutes = 0) =>
	new Date(Date.now() - days * 86_400_000 + minutes * 60_000);

export async function seedEpisodeWork(
	trx: Transaction<Database>,
	context: SeedContext
): Promise<void> {
	const person = (email: string) => {
		const id = context.people.get(email);
		if (!id) throw new Error(`demo person ${email} is missing`);
		return id;
	};

	const springs: Record<
		string,
		{
			frontSpring: 'leaf' | 'coil' | 'torsion' | 'strut';
			rearSpring: 'leaf' | 'coil' | 'torsion' | 'strut';
			frontLiftMethod: string | null;
			rearLiftMethod: string | null;
		}
	> = {
		mule: {
			frontSpring: 'strut',
			rearSpring: 'leaf',
			frontLiftMethod: 'strut-spacer',
			rearLiftMethod: 'lift-block'
		},
		tallboy: {
			frontSpring: 'coil',
			rearSpring: 'coil',
			frontLiftMethod: 'coil-spacer',
			rearLiftMethod: 'coil-spacer'
		},
		sandpiper: {
			frontSpring: 'torsion',
			rearSpring: 'torsion',
			frontLiftMethod: null,
			rearLiftMethod: null
		}
	};
	for (const [key, values] of Object.entries(springs)) {
		const buildId = context.builds.get(key);
		if (buildId) await trx.updateTable('build').set(values).where('id', '=', buildId).execute();
	}

	for (const [slug, seed] of Object.entries(work)) {
		const episode = context.episodes.get(slug);
		if (!episode) continue;
		const rate = episode.frameRate;
		const lastMove = seed.history[seed.history.length - 1];
		if (lastMove.to !== episode.stage)
			throw new Error(
				`demo history of ${slug} ends at ${lastMove.to}, but the episode is at ${episode.stage}`
			);

		for (const move of seed.history) {
			const previous = seed.history[seed.history.indexOf(move) - 1];
			await trx
				.insertInto('stageMove')
				.values({
					episodeId: episode.id,
					personId: person(move.by),
					fromStage: previous?.to ?? null,
					toStage: move.to,
					note: move.note ?? '',
					createdAt: daysAgo(move.daysAgo)
				})
				.execute();
		}
		await sql`UPDATE episode SET created_at = ${daysAgo(seed.history[0].daysAgo)} WHERE id = ${episode.id}`.execute(
			trx
		);

		if (demoSpans[slug] && demoSpans[slug].length !== seed.segments.length + 1)
			throw new Error(
				`demo cut points of ${slug} don't match its ${seed.segments.length} segments`
			);
		const segmentIds: string[] = [];
		const scripts: { id: string; body: string }[] = [];
		for (const [index, segment] of seed.segments.entries()) {
			const words = countSpokenWords(segment.script);
			const recordedFrames =
				segment.recorded === undefined
					? null
					: segment.recorded === 'spoken'
						? secondsToFrames(Math.round((words / RICO_RECORDED_WPM) * 60 + 2), rate)
						: frames(segment.recorded, rate);
			const promiseEpisodeId = segment.promise?.slug
				? (context.episodes.get(segment.promise.slug)?.id ?? null)
				: null;
			const hazards = segment.hazards ?? [];
			const cutPoints = demoSpans[slug];
			const span = cutPoints
				? {
						cutInFrame: frames(cutPoints[index], rate),
						cutOutFrame: frames(cutPoints[index + 1], rate)
					}
				: {};
			const row = await trx
				.insertInto('segment')
				.values({
					episodeId: episode.id,
					position: index + 1,
					kind: segment.kind,
					title: segment.title,
					plannedSeconds: segment.planned,
					buildId: segment.build ? (context.builds.get(segment.build) ?? null) : null,
					needsFootage: segment.needsFootage ?? true,
					hazards,
					recordedFrames,
					...span,
					promiseEpisodeId,
					promiseTitle: segment.promise?.title ?? null,
					createdAt: daysAgo(seed.history[0].daysAgo, index)
				})
				.returning('id')
				.executeTakeFirstOrThrow();
			segmentIds.push(row.id);
			scripts.push({ id: row.id, body: segment.script });
			const author =
				context.episodes.get(slug)!.channelId === context.channels.get('dunewagon') ? sam : rico;
			await trx
				.insertInto('segmentScript')
				.values({
					segmentId: row.id,
					body: segment.script,
					updatedBy: segment.script ? person(author) : null
				})
				.execute();
			for (const hazard of hazards) {
				const placement = segment.cautions?.[hazard];
				const text = placement?.text ?? hazardById(hazard).defaultCaution;
				await trx
					.insertInto('caution')
					.values({
						segmentId: row.id,
						hazard,
						text,
						atFrame: placement?.at ? frames(placement.at, rate) : null,
						durationFrames: secondsToFrames(readingSeconds(text) + CAUTION_MARGIN_SECONDS, rate)
					})
					.execute();
			}
			for (const [shotIndex, shot] of (segment.shots ?? []).entries()) {
				const shotRow = await trx
					.insertInto('shot')
					.values({
						segmentId: row.id,
						what: shot.what,
						angle: shot.angle,
						roll: shot.roll,
						camera: shot.camera,
						notes: shot.notes ?? '',
						position: shotIndex + 1
					})
					.returning('id')
					.executeTakeFirstOrThrow();
				for (const [clipName, sourceIn, sourceOut, good, withFootage, note] of shot.takes ?? []) {
					const sourceInFrames = frames(sourceIn, rate);
					const sourceOutFrames = frames(sourceOut, rate);
					// Rushes go up the day the episode moved to the edit (or the latest move, if it hasn't yet).
					const rushesUp = (
						seed.history.find((move) => move.to === 'edit') ?? seed.history[seed.history.length - 1]
					).daysAgo;
					const uploadedAt = daysAgo(rushesUp, index + shotIndex);
					const footageId = withFootage
						? await demoFootage(trx, {
								channelId: episode.channelId,
								episodeId: episode.id,
								clipName,
								camera: shot.camera,
								seconds: framesToSeconds(sourceOutFrames - sourceInFrames, rate),
								rate,
								uploadedBy: person(uploader(slug)),
								uploadedAt
							})
						: null;
					await trx
						.insertInto('take')
						.values({
							shotId: shotRow.id,
							clipName,
							sourceInFrames,
							sourceOutFrames,
							good,
							note: note ?? '',
							footageId
						})
						.execute();
				}
			}
		}

		const fingerprint = scriptFingerprint(scripts);
		const approval = [...seed.reviews].reverse().find((review) => review.kind === 'approved');
		await trx
			.updateTable('episode')
			.set({
				scriptStatus: seed.scriptStatus,
				scriptApprovedFingerprint: seed.scriptStatus === 'approved' ? fingerprint : null,
				scriptApprovedAt:
					seed.scriptStatus === 'approved' && approval ? daysAgo(approval.daysAgo) : null,
				scriptApprovedBy: seed.scriptStatus === 'approved' && approval ? person(approval.by) : null
			})
			.where('id', '=', episode.id)
			.execute();
		for (const [index, review] of seed.reviews.entries()) {
			await trx
				.insertInto('scriptReview')
				.values({
					episodeId: episode.id,
					segmentId: review.segment ? segmentIds[review.segment - 1] : null,
					personId: person(review.by),
					kind: review.kind,
					body: review.body ?? '',
					fingerprint: review.kind === 'approved' ? fingerprint : null,
					createdAt: daysAgo(review.daysAgo, index)
				})
				.execute();
		}
	}
}
