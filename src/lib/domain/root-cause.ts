/**
 * Root-cause hints for the workshop: why is this filter loading up? Each hint comes from the
 * pattern of the Δp history and the van's usage and profile, and says the numbers it rests on.
 * Hints are leads to check, not diagnoses.
 */
import type { CrossingForecast } from './forecast';
import type { UsageSummary } from './usage';
import type { Fuel } from './vocabulary';

export interface VehicleProfile {
	fuel?: Fuel;
	/** Engine oil specification as recorded, e.g. "ACEA C3" or "ACEA A3/B4". */
	oilSpec?: string;
	/** True when the engine maker requires a low-ash (ACEA C class) oil. */
	makerRequiresLowAshOil?: boolean;
	/** Oil topped up per 1,000 km, litres. */
	oilConsumptionLPer1000Km?: number;
	towingOrHeavyPayload?: boolean;
}

export const ROOT_CAUSES = [
	'ash_loading',
	'oil_spec',
	'oil_consumption',
	'engine_soot',
	'sensor_pipe_leak',
	'short_trips',
	'interrupted_regenerations',
	'fuel'
] as const;
export type RootCause = (typeof ROOT_CAUSES)[number];

export interface RootCauseHint {
	cause: RootCause;
	title: string;
	/** What to check, in the workshop's words. */
	detail: string;
	/** The numbers the hint rests on. */
	restsOn: string;
}

export interface RootCauseOptions {
	/** Post-regeneration baseline rise that points at ash, mbar per 1,000 km (default 0.5). */
	ashMbarPer1000Km?: number;
	/**
	 * Soot growth counted as fast, mbar per 1,000 km (default 150). When the fleet's median is
	 * given, twice that median is used instead.
	 */
	fastGrowthMbarPer1000Km?: number;
	fleetMedianGrowthMbarPer1000Km?: number;
	/**
	 * Completed regenerations closer together than this point at fast soot, km (default 500).
	 * When the fleet's median is given, half that median is used instead.
	 */
	shortRegenIntervalKm?: number;
	fleetMedianKmBetweenRegenerations?: number;
	/** Short-trip share counted as a short-trip duty cycle (default 0.6). */
	shortTripShareHigh?: number;
	/** Short-trip share at or below which the duty cycle counts as normal (default 0.4). */
	shortTripShareNormal?: number;
	/** Oil consumption worth a look, litres per 1,000 km (default 0.5). */
	oilConsumptionLPer1000Km?: number;
}

/**
 * Defaults: Sootcast's own thresholds, no published source; calibrate them on the fleet (or
 * pass the fleet medians). The simulated healthy van (simulate.ts defaults) grows about
 * 60–90 mbar per 1,000 km, regenerates every 1,000–1,500 km and gains about 0.5 mbar of ash
 * baseline per 1,000 km.
 */
export const ROOT_CAUSE_DEFAULTS = Object.freeze({
	ashMbarPer1000Km: 0.5,
	fastGrowthMbarPer1000Km: 150,
	shortRegenIntervalKm: 500,
	shortTripShareHigh: 0.6,
	shortTripShareNormal: 0.4,
	oilConsumptionLPer1000Km: 0.5
});

function percent(share: number): string {
	return `${Math.round(share * 100)} %`;
}

/**
 * Hints from pattern and profile:
 * - rising post-regeneration baseline → ash; check oil spec (low-ash ACEA C class where the
 *   maker requires it) and oil consumption; only off-vehicle cleaning removes ash;
 * - fast soot growth on a normal duty cycle → the engine makes too much soot: injectors, EGR,
 *   boost leaks, turbo oil leaks, thermostat;
 * - flat, near-zero Δp under load → sensor pipe split or disconnected;
 * - regenerations cut short, or mostly short trips → the duty cycle;
 * - fuel facts when the fuel is known.
 */
export function findRootCauseHints(
	forecast: CrossingForecast,
	usage: UsageSummary | null,
	profile: VehicleProfile = {},
	options: RootCauseOptions = {}
): RootCauseHint[] {
	const o = { ...ROOT_CAUSE_DEFAULTS, ...options };
	const hints: RootCauseHint[] = [];
	const add = (cause: RootCause, title: string, detail: string, restsOn: string) =>
		hints.push({ cause, title, detail, restsOn });

	if (forecast.state === 'implausible_readings') {
		add(
			'sensor_pipe_leak',
			'Sensor pipe leak suspected',
			'Δp under load is flat and near zero. Check the pipes between the filter and the sensor for splits, loose ends or blockage, then the sensor itself (zero at 0.5 V, range with a vacuum pump). A leaking pipe makes a blocked filter look healthy.',
			forecast.explanation
		);
		return hints;
	}

	const ash = forecast.baseline?.mbarPer1000Km ?? null;
	if (ash !== null && ash >= o.ashMbarPer1000Km) {
		add(
			'ash_loading',
			'Ash building up',
			'The level after each regeneration keeps rising, which burning soot cannot explain: ash from oil additives stays in the filter. Only off-vehicle cleaning or replacement removes it. Check the oil specification and how much oil the engine uses.',
			`post-regeneration baseline +${ash.toFixed(2)} mbar per 1,000 km over ${forecast.baseline?.cycles} cycles (line: ${o.ashMbarPer1000Km})`
		);
	}
	const spec = profile.oilSpec?.trim();
	if (profile.makerRequiresLowAshOil && spec !== undefined && !/\bC\s*\d/i.test(spec)) {
		add(
			'oil_spec',
			'Oil is not a low-ash grade',
			`The maker asks for a low-ash ACEA C class oil; "${spec}" is not one. Higher-ash oil fills the filter with ash faster.`,
			`recorded oil spec "${spec}"; maker requires low-ash oil`
		);
	}
	if (
		profile.oilConsumptionLPer1000Km !== undefined &&
		profile.oilConsumptionLPer1000Km >= o.oilConsumptionLPer1000Km
	) {
		add(
			'oil_consumption',
			'Engine using oil',
			'Oil that burns in the engine leaves its ash in the filter. Look for worn rings or valve seals and turbo seal leaks.',
			`${profile.oilConsumptionLPer1000Km} L per 1,000 km (line: ${o.oilConsumptionLPer1000Km})`
		);
	}

	const growth = forecast.growth?.mbarPer1000Km ?? null;
	const fastLine =
		options.fleetMedianGrowthMbarPer1000Km !== undefined
			? 2 * options.fleetMedianGrowthMbarPer1000Km
			: o.fastGrowthMbarPer1000Km;
	const kmBetween = forecast.regenerations.kmBetween;
	const shortInterval =
		options.fleetMedianKmBetweenRegenerations !== undefined
			? options.fleetMedianKmBetweenRegenerations / 2
			: o.shortRegenIntervalKm;
	const fastGrowth = growth !== null && growth >= fastLine;
	const frequentRegens = kmBetween !== null && kmBetween <= shortInterval;
	const shortShare = usage?.shortTripShare ?? null;
	if (
		(fastGrowth || frequentRegens) &&
		shortShare !== null &&
		shortShare <= o.shortTripShareNormal
	) {
		const facts = [
			growth !== null
				? `soot growth ${growth.toFixed(0)} mbar per 1,000 km (line ${fastLine.toFixed(0)})`
				: null,
			kmBetween !== null
				? `a regeneration every ${kmBetween.toFixed(0)} km (line ${shortInterval.toFixed(0)})`
				: null,
			`${percent(shortShare)} short trips`
		];
		add(
			'engine_soot',
			'Engine making too much soot',
			'Soot builds up fast although the van mostly makes proper runs. Check injectors (leak-off, balance), the EGR valve and cooler, boost pipes for leaks, the turbo for oil leaks, and the thermostat (an engine that runs cold makes more soot).',
			facts.filter(Boolean).join('; ')
		);
	}

	const interrupted = forecast.regenerations.interruptedInCurrentCycle;
	if (interrupted >= 3 || forecast.mode === 'not_regenerating') {
		add(
			'interrupted_regenerations',
			'Regenerations not completing',
			'The engine keeps starting regenerations that do not finish, so soot piles up. Usually the trips are too short; also check for faults that block regeneration (stored fault codes, exhaust temperature sensors).',
			`${interrupted} interrupted regenerations since the last completed one${usage?.regenCapablePerWeek !== undefined ? `; ${usage.regenCapablePerWeek.toFixed(1)} regeneration-capable drives a week` : ''}`
		);
	}
	if (usage && shortShare !== null && shortShare >= o.shortTripShareHigh) {
		add(
			'short_trips',
			'Short-trip duty cycle',
			'Most trips end before the exhaust is hot enough for the filter to clean itself. A route change or a weekly steady run fixes the cause; cleaning only treats it.',
			`${percent(shortShare)} of ${usage.trips} trips short; ${usage.regenCapablePerWeek.toFixed(1)} regeneration-capable drives a week; idle ${usage.idleShare === null ? 'n/a' : percent(usage.idleShare)}`
		);
	}

	if (profile.fuel === 'biodiesel_blend') {
		add(
			'fuel',
			'Biodiesel blend',
			'Biodiesel blends above what EN 590 allows (7 % FAME) are linked to oil dilution during active regenerations and to deposits; check the oil level and condition and whether the maker approves the blend. (From memory; confirm with the maker.)',
			'recorded fuel: biodiesel blend'
		);
	} else if (profile.fuel === 'paraffinic_en15940' && (fastGrowth || frequentRegens)) {
		add(
			'fuel',
			'Paraffinic fuel is not the cause',
			'Paraffinic diesel (EN 15940) generally forms less soot than EN 590 fuel, so the fast loading points at the engine or the duty cycle rather than the fuel. (From memory.)',
			`recorded fuel: paraffinic EN 15940; ${growth !== null ? `soot growth ${growth.toFixed(0)} mbar per 1,000 km` : `a regeneration every ${kmBetween?.toFixed(0)} km`}`
		);
	}
	if (profile.towingOrHeavyPayload && (fastGrowth || frequentRegens)) {
		add(
			'engine_soot',
			'Heavy work',
			'Towing or heavy payloads raise fuelling and soot output; compare with a van on the same work before looking for faults.',
			'towing or heavy payload recorded, with fast soot loading (see above)'
		);
	}
	return hints;
}
