/**
 * The demo world: a fictional channel run by a fictional parts retailer, its crew, two project
 * vehicles, a parts catalogue of fictional brands, and episodes at different stages. A second small
 * channel shares the editor. Every name, address and brand here is invented.
 */
export const DEMO_PASSWORD = 'wrenchroll-demo-bay3';

export const demoChannels = [
	{
		key: 'torquehaven',
		name: 'Torquehaven Garage',
		frameRate: '29.97',
		callToAction:
			'Every part in this episode is in the Torquehaven shop. New installs every other Friday: subscribe so you catch the next one.',
		contact:
			'Fitment questions: fitment@torquehaven.test · Torquehaven Supply, Bay 3, Millbrook Works (fictional demo address)',
		disclosure:
			'This channel is run by Torquehaven Supply: the parts links below go to our own shop, and we earn on what you buy through them.',
		crew: [
			{ name: 'Dana Okafor', email: 'dana@torquehaven.test', roles: ['producer'] },
			{ name: 'Rico Valdane', email: 'rico@torquehaven.test', roles: ['host'] },
			{ name: 'Mika Strand', email: 'mika@torquehaven.test', roles: ['camera'] },
			{ name: 'Jules Farrow', email: 'jules@cutbench.test', roles: ['editor'] },
			{ name: 'Priya Lindqvist', email: 'priya@torquehaven.test', roles: ['merch'] }
		]
	},
	{
		key: 'dunewagon',
		name: 'Dune Wagon Weekly',
		frameRate: '25',
		callToAction: 'More sand-rail rebuilds every week.',
		contact: 'hello@dunewagon.test',
		disclosure:
			'We earn a small commission when you buy through the parts links below; it costs you nothing extra.',
		crew: [
			{ name: 'Sam Ortega', email: 'sam@dunewagon.test', roles: ['producer', 'host', 'camera'] },
			{ name: 'Jules Farrow', email: 'jules@cutbench.test', roles: ['editor'] }
		]
	}
] as const;

export const demoBuilds = {
	torquehaven: [
		{
			key: 'mule',
			name: 'Project Mule',
			year: 2004,
			vehicleType: 'Midsize pickup, extended cab',
			drivetrain: 'Part-time 4WD',
			frontSuspension: 'Independent, coil-over struts',
			rearSuspension: 'Leaf-sprung solid axle',
			frontLiftIn: 2,
			rearLiftIn: 3,
			tyreSize: '285/70R17',
			notes: 'Daily driver that tows a small camper. Rear block lift and front strut spacers.'
		},
		{
			key: 'tallboy',
			name: 'Project Tallboy',
			year: 1998,
			vehicleType: 'Full-size SUV',
			drivetrain: 'Full-time 4WD',
			frontSuspension: 'Solid axle, coil springs',
			rearSuspension: 'Solid axle, coil springs',
			frontLiftIn: 1.5,
			rearLiftIn: 1.5,
			tyreSize: '33x12.50R15',
			notes: 'Trail rig. Coil spacers front and rear.'
		}
	],
	dunewagon: [
		{
			key: 'sandpiper',
			name: 'Sandpiper',
			year: 1979,
			vehicleType: 'Two-seat sand rail',
			drivetrain: 'Rear-wheel drive',
			frontSuspension: 'Beam axle, torsion leaves',
			rearSuspension: 'Swing axle',
			frontLiftIn: 0,
			rearLiftIn: 0,
			tyreSize: '225/70R15',
			notes: 'Brake and steering refresh this season.'
		}
	]
} as const;

type PartSeed = [
	sku: string,
	name: string,
	category: string,
	brand: string,
	price: number,
	fitment: string,
	status?: 'active' | 'discontinued' | 'out_of_stock'
];

/** At least 30 parts, fictional brands: Kingbolt Suspension, Quillon Shocks, Halvard Wheel Co., Cindertrack Tyres, Northpine Brake Works, Cobalt Steer. */
export const demoParts: PartSeed[] = [
	[
		'KBS-LB-200',
		'2 in lift block pair, cast',
		'Lift blocks',
		'Kingbolt Suspension',
		89.0,
		'Rear leaf-sprung axles only.'
	],
	[
		'KBS-LB-300',
		'3 in lift block pair, cast',
		'Lift blocks',
		'Kingbolt Suspension',
		99.0,
		'Rear leaf-sprung axles only. Check driveshaft angle.'
	],
	[
		'KBS-LB-300T',
		'3 in tapered lift block pair, 2°',
		'Lift blocks',
		'Kingbolt Suspension',
		119.0,
		'Rear leaf-sprung axles; corrects pinion angle.'
	],
	[
		'KBS-AAL-150',
		'Add-a-leaf, 1.5 in, pair',
		'Leaf springs',
		'Kingbolt Suspension',
		149.0,
		'Multi-leaf rear packs with centre pin.'
	],
	[
		'KBS-AAL-200',
		'Add-a-leaf, 2 in, pair',
		'Leaf springs',
		'Kingbolt Suspension',
		159.0,
		'Multi-leaf rear packs with centre pin.'
	],
	[
		'KBS-UB-58-9',
		'U-bolt kit, 5/8 in × 9 in, set of 4',
		'U-bolts',
		'Kingbolt Suspension',
		54.0,
		'Pairs with 2–3 in blocks on 2.5 in axle tubes.'
	],
	[
		'KBS-UB-58-11',
		'U-bolt kit, 5/8 in × 11 in, set of 4',
		'U-bolts',
		'Kingbolt Suspension',
		59.0,
		'Pairs with 3–4 in blocks.'
	],
	[
		'KBS-SHK-1',
		'Extended shackle pair, 1 in',
		'Shackles',
		'Kingbolt Suspension',
		69.0,
		'Rear leaf packs; check tailpipe clearance.'
	],
	[
		'KBS-CS-150',
		'Coil spacer pair, 1.5 in, polyurethane',
		'Coil spacers',
		'Kingbolt Suspension',
		64.0,
		'Solid-axle coil springs.'
	],
	[
		'KBS-CS-200',
		'Coil spacer pair, 2 in, aluminium',
		'Coil spacers',
		'Kingbolt Suspension',
		94.0,
		'Solid-axle coil springs.'
	],
	[
		'KBS-SS-200',
		'Strut spacer pair, 2 in',
		'Strut spacers',
		'Kingbolt Suspension',
		109.0,
		'Independent front coil-over struts.'
	],
	[
		'KBS-BL-OLD',
		'Block lift kit, 4 in (old casting)',
		'Lift blocks',
		'Kingbolt Suspension',
		129.0,
		'Superseded by KBS-LB-400.',
		'discontinued'
	],
	[
		'QS-MT-210F',
		'Monotube shock, front, 2–3 in lift',
		'Shocks',
		'Quillon Shocks',
		124.0,
		'Midsize pickups with 2–3 in lift.'
	],
	[
		'QS-MT-230R',
		'Monotube shock, rear, 3 in lift',
		'Shocks',
		'Quillon Shocks',
		118.0,
		'Leaf-sprung rears with 3 in blocks.'
	],
	[
		'QS-TT-250',
		'Twin-tube shock, rear, 1.5–2.5 in',
		'Shocks',
		'Quillon Shocks',
		79.0,
		'Solid-axle coil rears.'
	],
	['QS-SB-01', 'Shock boot pair', 'Shocks', 'Quillon Shocks', 22.0, 'Fits Quillon monotubes.'],
	[
		'HW-RK17-85',
		'Ranger 17 × 8.5 in wheel, 6 × 139.7, +0 mm',
		'Wheels',
		'Halvard Wheel Co.',
		189.0,
		'Hub-centric ring included for 106 mm bore.'
	],
	[
		'HW-RK17-90',
		'Ranger 17 × 9 in wheel, 6 × 139.7, −12 mm',
		'Wheels',
		'Halvard Wheel Co.',
		199.0,
		'Check fender clearance at full lock.'
	],
	[
		'HW-BD15-10',
		'Bead ring 15 × 10 in wheel, 5 × 139.7',
		'Wheels',
		'Halvard Wheel Co.',
		229.0,
		'Cosmetic bead ring, not a beadlock.'
	],
	[
		'HW-LN-1420',
		'Lug nut set, M14 × 1.5, 24 pcs',
		'Wheel hardware',
		'Halvard Wheel Co.',
		39.0,
		'Conical seat.'
	],
	[
		'CT-AT-2857017',
		'Trailgrip A/T 285/70R17 121/118S',
		'Tyres',
		'Cindertrack Tyres',
		264.0,
		'LT load range E.'
	],
	[
		'CT-AT-2657017',
		'Trailgrip A/T 265/70R17 115T',
		'Tyres',
		'Cindertrack Tyres',
		221.0,
		'P-metric.'
	],
	[
		'CT-MT-33125015',
		'Rockhound M/T 33x12.50R15',
		'Tyres',
		'Cindertrack Tyres',
		248.0,
		'Flotation size, load range C.'
	],
	[
		'CT-HT-2257015',
		'Roadline H/T 225/70R15',
		'Tyres',
		'Cindertrack Tyres',
		138.0,
		'P-metric.',
		'out_of_stock'
	],
	[
		'NB-BL-EXT2',
		'Extended front brake lines, +2 in, pair',
		'Brake lines',
		'Northpine Brake Works',
		74.0,
		'Stainless braided; for 2–3 in front lift.'
	],
	[
		'NB-BL-REAR',
		'Extended rear brake hose, +3 in',
		'Brake lines',
		'Northpine Brake Works',
		42.0,
		'Solid rear axles.'
	],
	[
		'NB-PAD-HD',
		'Heavy-duty brake pad set, front',
		'Brakes',
		'Northpine Brake Works',
		68.0,
		'Bedding procedure in the box.'
	],
	[
		'NB-FL-DOT4',
		'Brake fluid DOT 4, 1 L',
		'Fluids',
		'Northpine Brake Works',
		16.0,
		'Never mix with DOT 5 silicone fluid.'
	],
	[
		'CS-PA-DROP',
		'Dropped pitman arm, 2–4 in lift',
		'Steering',
		'Cobalt Steer',
		96.0,
		'Solid front axles with drag link.'
	],
	[
		'CS-SS-110',
		'Steering stabiliser, 110 mm stroke',
		'Steering',
		'Cobalt Steer',
		84.0,
		'Solid front axles.'
	],
	[
		'CS-TRE-HD',
		'Heavy-duty tie rod end',
		'Steering',
		'Cobalt Steer',
		58.0,
		'Torque castle nut, then fit a new cotter pin.'
	],
	[
		'CS-TB-ADJ',
		'Adjustable track bar',
		'Steering',
		'Cobalt Steer',
		219.0,
		'Recentres the axle after a lift.'
	],
	[
		'KBS-BS-6T',
		'Jack stand pair, 6 t rated',
		'Shop equipment',
		'Kingbolt Suspension',
		79.0,
		'Rated capacity per pair.'
	],
	[
		'KBS-TW-250',
		'Click torque wrench, 1/2 in drive, 30–250 ft·lbf',
		'Shop equipment',
		'Kingbolt Suspension',
		119.0,
		'Store at its lowest setting.'
	]
];

export const demoEpisodes = {
	torquehaven: [
		{
			slug: 'mule-rear-block-lift',
			title: '3-inch rear block lift on Project Mule',
			logline:
				'Rico levels out Project Mule with a tapered rear block, longer U-bolts and matched shocks, in one afternoon in Bay 3.',
			targetRuntimeSeconds: 840,
			stage: 'edit',
			publishDaysFromNow: 9,
			builds: ['mule']
		},
		{
			slug: 'mule-285-tyres',
			title: 'Fitting 285/70R17 tyres without rubbing',
			logline:
				'Bigger tyres on a lifted midsize pickup: what the numbers say about clearance and the speedometer.',
			targetRuntimeSeconds: 660,
			stage: 'script',
			publishDaysFromNow: 23,
			builds: ['mule']
		},
		{
			slug: 'tallboy-coil-spacers',
			title: 'Coil spacer lift on Project Tallboy',
			logline: 'An inch and a half front and rear with coil spacers, and why it adds no travel.',
			targetRuntimeSeconds: 720,
			stage: 'published',
			publishDaysFromNow: -14,
			builds: ['tallboy']
		}
	],
	dunewagon: [
		{
			slug: 'sandpiper-brake-refresh',
			title: 'Sandpiper brake refresh',
			logline: 'New lines, pads and fluid on a 1979 sand rail.',
			targetRuntimeSeconds: 600,
			stage: 'shoot',
			publishDaysFromNow: 5,
			builds: ['sandpiper']
		}
	]
} as const;
