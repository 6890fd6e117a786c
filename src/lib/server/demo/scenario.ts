import type { DutyCycleProfile, SimulateVanOptions } from '../../domain/simulate';

/**
 * The invented demo world: Larkspur Lane Deliveries, three depots, two contracted workshops,
 * a second small fleet (Thistledown Utilities) so organisation scoping has something to hide.
 * Every name, place and plate here is made up.
 */
export const DEMO_PASSWORD = 'sootcast-demo';
export const DEMO_DAYS = 548; // about 18 months

export const DEMO_ACCOUNTS = {
	admin: { email: 'admin@sootcast.test', name: 'Rowan Achterberg' },
	fleetManager: { email: 'maren.okafor@larkspur.test', name: 'Maren Okafor' },
	otherFleetManager: { email: 'jules.pemberly@thistledown.test', name: 'Jules Pemberly' },
	workshop: { email: 'tomas.reyne@fenwright.test', name: 'Tomas Reyne' },
	otherWorkshop: { email: 'asha.lindqvist@copperbeech.test', name: 'Asha Lindqvist' },
	driver: { email: 'ida.brennock@larkspur.test', name: 'Ida Brennock' }
} as const;

export const DRIVER_NAMES = [
	'Ida Brennock',
	'Caspian Moyo',
	'Wren Halloway',
	'Bastian Oyelaran',
	'Elodie Farquar',
	'Nikolai Strand',
	'Priya Castellan',
	'Odhran Vell',
	'Saoirse Quill',
	'Matteo Ashgrove',
	'Yusuf Tenterden',
	'Linnea Boorman'
];

/** Parcel rounds in town: many short hops, lots of idling. */
const URBAN_PARCEL: DutyCycleProfile = {
	tripsPerWorkingDay: 11,
	shortTripShare: 0.8,
	shortTripKm: 4,
	shortTripMinutes: 11,
	longTripKm: 28,
	longTripMinutes: 32,
	idleShare: 0.22,
	workingDaysPerWeek: 6
};
/** Mixed town and ring-road work. */
const MIXED: DutyCycleProfile = {
	tripsPerWorkingDay: 6,
	shortTripShare: 0.5,
	shortTripKm: 6,
	shortTripMinutes: 14,
	longTripKm: 40,
	longTripMinutes: 40,
	idleShare: 0.12,
	workingDaysPerWeek: 5
};
/** Trades vans between sites: a few long steady runs a day. */
const REGIONAL: DutyCycleProfile = {
	tripsPerWorkingDay: 4,
	shortTripShare: 0.25,
	shortTripKm: 7,
	shortTripMinutes: 15,
	longTripKm: 65,
	longTripMinutes: 55,
	idleShare: 0.06,
	workingDaysPerWeek: 5
};

export interface DemoVan {
	registration: string;
	makeModel: string;
	depot: 0 | 1 | 2;
	fleet: 'larkspur' | 'thistledown';
	oilGrade: string;
	emissionClass: string;
	fuel: 'en590_diesel' | 'biodiesel_blend' | 'paraffinic_en15940';
	/** Index into DRIVER_NAMES, or null for a pool van. */
	driver: number | null;
	/** What makes this van interesting in the demo. */
	story: string;
	simulation: Omit<SimulateVanOptions, 'seed' | 'start' | 'days'>;
}

export const DEPOTS = [
	{ name: 'Northmoor depot', town: 'Ashby Fold' },
	{ name: 'Eastgate depot', town: 'Kelmsworth' },
	{ name: 'Riverside depot', town: 'Tarnbridge' }
] as const;

const MODELS = [
	'Compact panel van 1.5',
	'Mid panel van 2.0',
	'Large panel van 2.2',
	'Crew van 2.0'
];

/** The forty Larkspur vans and five Thistledown vans, each with its own duty cycle and story. */
export function demoVans(): DemoVan[] {
	const vans: DemoVan[] = [];
	for (let i = 0; i < 40; i++) {
		const depot = (i % 3) as 0 | 1 | 2;
		const profile = depot === 0 ? URBAN_PARCEL : depot === 1 ? MIXED : REGIONAL;
		const van: DemoVan = {
			registration: `LKD ${String(401 + i)}`,
			makeModel: MODELS[i % MODELS.length],
			depot,
			fleet: 'larkspur',
			oilGrade: i % 7 === 3 ? '10W-40 full-ash' : '5W-30 ACEA C2',
			emissionClass: i % 5 === 0 ? 'Euro 5' : 'Euro 6d',
			fuel: i % 9 === 4 ? 'biodiesel_blend' : 'en590_diesel',
			driver: i < DRIVER_NAMES.length ? i : null,
			story:
				depot === 0
					? 'Town parcel round: short trips'
					: depot === 1
						? 'Mixed round'
						: 'Regional trades runs',
			simulation: {
				profile,
				initialOdometerKm: 30_000 + i * 4_100,
				initialAshMbar: 6 + (i % 6) * 3
			}
		};
		vans.push(van);
	}
	// The vans the demo is built around.
	Object.assign(vans[0], {
		story: 'Short-trip round whose regenerations keep being interrupted: heading for the line',
		simulation: {
			...vans[0].simulation,
			profile: { ...URBAN_PARCEL, shortTripShare: 0.92 },
			initialAshMbar: 40,
			ashMbarPer1000Km: 1.2,
			regenFailsFromDay: 541
		}
	});
	Object.assign(vans[1], {
		story: 'Engine making extra soot (suspected injector); already past the line',
		simulation: {
			...vans[1].simulation,
			sootMultiplier: 1.7,
			initialAshMbar: 70,
			regenFailsFromDay: 528
		}
	});
	Object.assign(vans[2], {
		story: 'Sensor pipe split: reads implausibly low under load',
		simulation: { ...vans[2].simulation, sensorLeakFromDay: 420 }
	});
	Object.assign(vans[3], {
		story: 'Filter cleaned off the vehicle mid-history; full-ash oil raises the baseline again',
		simulation: {
			...vans[3].simulation,
			filterCleanedOnDay: 260,
			initialAshMbar: 55,
			ashMbarPer1000Km: 1.6
		}
	});
	Object.assign(vans[6], {
		story: 'Active regenerations inhibited for the last weeks: climbing fast',
		simulation: { ...vans[6].simulation, regenFailsFromDay: 543, initialAshMbar: 30 }
	});
	Object.assign(vans[9], {
		story: 'Heavy short-trip use and high ash: crossing within months',
		simulation: {
			...vans[9].simulation,
			profile: { ...URBAN_PARCEL, shortTripShare: 0.88, idleShare: 0.3 },
			initialAshMbar: 55,
			ashMbarPer1000Km: 2.4
		}
	});
	Object.assign(vans[12], {
		story: 'Service regeneration at the workshop after a run of short trips',
		simulation: {
			...vans[12].simulation,
			serviceRegenOnDays: [330, 470],
			initialAshMbar: 45,
			ashMbarPer1000Km: 1.6
		}
	});
	Object.assign(vans[15], {
		story: 'Filter replaced after a blockage a year ago',
		simulation: { ...vans[15].simulation, filterReplacedOnDay: 180, initialAshMbar: 80 }
	});
	Object.assign(vans[20], {
		story: 'Full-ash oil for two years: the baseline is climbing towards the line',
		oilGrade: '10W-40 full-ash',
		simulation: { ...vans[20].simulation, initialAshMbar: 35, ashMbarPer1000Km: 1.7 }
	});
	Object.assign(vans[30], {
		story: 'High oil consumption: ash builds faster than on its sister vans',
		simulation: { ...vans[30].simulation, initialAshMbar: 40, ashMbarPer1000Km: 2.0 }
	});
	for (let i = 0; i < 5; i++) {
		vans.push({
			registration: `TDU ${String(71 + i)}`,
			makeModel: MODELS[(i + 1) % MODELS.length],
			depot: 0,
			fleet: 'thistledown',
			oilGrade: '5W-30 ACEA C3',
			emissionClass: 'Euro 6d',
			fuel: 'paraffinic_en15940',
			driver: null,
			story: 'Utilities maintenance van',
			simulation: { profile: REGIONAL, initialOdometerKm: 52_000 + i * 9_000, initialAshMbar: 10 }
		});
	}
	return vans;
}
