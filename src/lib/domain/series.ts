/**
 * Comparable series: Δp depends on exhaust flow as much as on soot, so readings taken at idle,
 * at raised idle and on the road cannot share one trend line raw. This module sorts a van's
 * readings into series that can, and picks the one the forecast runs on.
 */
import type { TestCondition } from './vocabulary';

// ─── Gas ──────────────────────────────────────────────────────────────────────────────────

/**
 * Specific gas constant of dry air, J/(kg·K): the WMO value (WMO-No. 8, CIMO Guide, Vol. I
 * ch. 3; listed beside the ISA/USSA 1976 values in reference/gas.md — they differ in the 5th digit).
 * Exhaust is treated as air: lean diesel exhaust is close to it (within about 1 %, from memory).
 */
export const AIR_GAS_CONSTANT_J_PER_KG_K = 287.05;

/** Standard sea-level pressure, kPa (ICAO Standard Atmosphere and USSA 1976: 101 325 Pa, exact). */
export const STANDARD_PRESSURE_KPA = 101.325;

/** 0 °C in kelvin (exact, SI definition). */
const ZERO_CELSIUS_K = 273.15;

/**
 * Density of dry air as an ideal gas, ρ = p / (R·T).
 * @param temperatureC −100…1000 °C
 * @param pressureKpa absolute pressure, kPa (default 101.325)
 * @param gasConstant specific gas constant, J/(kg·K) (default {@link AIR_GAS_CONSTANT_J_PER_KG_K})
 * @returns kg/m³; 1.2250 at 15 °C and 101.325 kPa, the ISA sea-level density (reference/gas.md)
 */
export function airDensityKgM3(
	temperatureC: number,
	pressureKpa = STANDARD_PRESSURE_KPA,
	gasConstant = AIR_GAS_CONSTANT_J_PER_KG_K
): number {
	return (pressureKpa * 1000) / (gasConstant * (temperatureC + ZERO_CELSIUS_K));
}

/**
 * Volumetric flow of exhaust treated as air, Q = ṁ·R·T / p (ideal gas law).
 * Ambient pressure stands in for the pressure inside the filter: ignoring the back-pressure
 * (a few hundred mbar at most) biases every reading of a van the same way, so trends stay
 * comparable.
 * @param massFlowKgH exhaust (≈ intake air) mass flow, kg/h, > 0
 * @param temperatureC exhaust temperature, °C
 * @param pressureKpa absolute pressure, kPa (default 101.325 when a reading has none)
 * @returns m³/s; 199.8 kg/h at 0 °C, 101.325 kPa gives 0.042 947 (check value in reference/gas.md)
 */
export function volumetricFlowM3s(
	massFlowKgH: number,
	temperatureC: number,
	pressureKpa = STANDARD_PRESSURE_KPA
): number {
	return massFlowKgH / 3600 / airDensityKgM3(temperatureC, pressureKpa);
}

/**
 * Default reference flow of a van: 300 kg/h of exhaust at 350 °C and 101.325 kPa
 * (≈ 0.147 m³/s), a light-van road-load operating point. Our assumption, no published source;
 * set it per vehicle when its road-load test point is known.
 */
export const DEFAULT_REFERENCE_FLOW_M3S = volumetricFlowM3s(300, 350);

/**
 * Scales a Δp reading to the reference flow, assuming the filter wall behaves as a porous
 * medium in laminar (Darcy) flow: Δp ∝ Q, so Δp_ref = Δp · Q_ref / Q.
 * Limits: the inertial (Forchheimer) part grows with Q², so readings far from the reference
 * flow scale less well; {@link buildSeries} keeps only readings within a flow window.
 * @param deltaPMbar measured Δp, mbar
 * @param flowM3s volumetric flow at the reading, m³/s, > 0
 * @param referenceFlowM3s the van's reference flow, m³/s
 */
export function scaleToReferenceFlow(
	deltaPMbar: number,
	flowM3s: number,
	referenceFlowM3s: number
): number {
	return (deltaPMbar * referenceFlowM3s) / flowM3s;
}

// ─── Readings and series ──────────────────────────────────────────────────────────────────

/** A Δp reading as the engine sees it: already converted to mbar. */
export interface PressureReading {
	at: Date;
	odometerKm: number;
	deltaPMbar: number;
	condition: TestCondition;
	rpm?: number;
	airMassFlowKgH?: number;
	exhaustTempC?: number;
	ambientPressureKpa?: number;
}

/** The kinds of comparable series, in order of preference. */
export const SERIES_KINDS = ['flow_normalised', 'road_load', 'raised_idle', 'idle'] as const;
export type SeriesKind = (typeof SERIES_KINDS)[number];

export interface ConditionLimit {
	/** Readings at or below this are what a healthy filter shows, mbar. */
	healthyMaxMbar: number;
	/** The concern line: above it the filter is a problem, mbar. */
	concernMbar: number;
}

/**
 * Limits per series kind. Road load and flow-normalised (which is scaled to a road-load flow):
 * healthy up to about 220 mbar, above 300 mbar a problem. Idle: healthy up to about
 * 100–120 mbar; we draw the idle line at the top of that range.
 * check value: common trade practice, no published source (DOMAIN.md rules of thumb).
 * Raised idle (≈ 2,000 rpm) sits between; 160/200 mbar is our own interpolation, no source.
 */
export const DEFAULT_LIMITS: Readonly<Record<SeriesKind, ConditionLimit>> = Object.freeze({
	flow_normalised: { healthyMaxMbar: 220, concernMbar: 300 },
	road_load: { healthyMaxMbar: 220, concernMbar: 300 },
	raised_idle: { healthyMaxMbar: 160, concernMbar: 200 },
	idle: { healthyMaxMbar: 100, concernMbar: 120 }
});

export const SERIES_LABELS: Readonly<Record<SeriesKind, string>> = Object.freeze({
	flow_normalised: 'Δp scaled to the reference exhaust flow',
	road_load: 'road-load readings',
	raised_idle: 'raised-idle readings',
	idle: 'idle readings'
});

export interface SeriesOptions {
	/** The van's reference volumetric flow, m³/s (default {@link DEFAULT_REFERENCE_FLOW_M3S}). */
	referenceFlowM3s?: number;
	/** A series needs this many points to be chosen over a less preferred kind (default 8). */
	minPoints?: number;
	/** Flow window for scaling, as a share of the reference flow (default 0.4–2.0). */
	minFlowRatio?: number;
	maxFlowRatio?: number;
	/** Raised-idle readings within this share of the group's rpm are comparable (default 0.1). */
	rpmTolerance?: number;
	/** Per-kind overrides of {@link DEFAULT_LIMITS}. */
	limits?: Partial<Record<SeriesKind, Partial<ConditionLimit>>>;
}

export interface SeriesPoint {
	at: Date;
	odometerKm: number;
	/** Comparable Δp (scaled to the reference flow for `flow_normalised`), mbar. */
	deltaPMbar: number;
	/** Δp as measured, mbar. */
	measuredMbar: number;
}

export interface ComparableSeries {
	kind: SeriesKind;
	/** Raised idle only: the engine speed the series was taken at. */
	rpm?: number;
	limit: ConditionLimit;
	/** Sorted by time. */
	points: SeriesPoint[];
	/** Readings of this kind that could not join it, with why. */
	skipped: { reason: string; count: number }[];
	/** One sentence on why this series was chosen. */
	rule: string;
}

/**
 * Builds one comparable series of the given kind.
 * - `flow_normalised`: every reading with air mass flow and exhaust temperature, scaled to the
 *   reference flow (Darcy), kept only inside the flow window.
 * - `road_load`: road-load readings, raw.
 * - `raised_idle`: raised-idle readings at the most common stated rpm (±tolerance), raw.
 * - `idle`: idle readings, raw.
 */
export function buildSeries(
	readings: readonly PressureReading[],
	kind: SeriesKind,
	options: SeriesOptions = {}
): ComparableSeries {
	const limit = { ...DEFAULT_LIMITS[kind], ...options.limits?.[kind] };
	const skipped: { reason: string; count: number }[] = [];
	let points: SeriesPoint[] = [];
	let rpm: number | undefined;

	if (kind === 'flow_normalised') {
		const referenceFlowM3s = options.referenceFlowM3s ?? DEFAULT_REFERENCE_FLOW_M3S;
		const minRatio = options.minFlowRatio ?? 0.4;
		const maxRatio = options.maxFlowRatio ?? 2;
		let outside = 0;
		let telemetryWithoutFlow = 0;
		for (const r of readings) {
			if (r.airMassFlowKgH === undefined || r.exhaustTempC === undefined) {
				if (r.condition === 'telemetry') telemetryWithoutFlow++;
				continue;
			}
			if (r.airMassFlowKgH <= 0) continue;
			const flowM3s = volumetricFlowM3s(
				r.airMassFlowKgH,
				r.exhaustTempC,
				r.ambientPressureKpa ?? STANDARD_PRESSURE_KPA
			);
			const ratio = flowM3s / referenceFlowM3s;
			// Low flows amplify noise when scaled up; high flows leave Darcy's linear range.
			if (ratio < minRatio || ratio > maxRatio) {
				outside++;
				continue;
			}
			points.push({
				at: r.at,
				odometerKm: r.odometerKm,
				deltaPMbar: scaleToReferenceFlow(r.deltaPMbar, flowM3s, referenceFlowM3s),
				measuredMbar: r.deltaPMbar
			});
		}
		addSkipped(skipped, 'flow outside the window where scaling holds', outside);
		addSkipped(skipped, 'telemetry without mass flow or exhaust temperature', telemetryWithoutFlow);
	} else if (kind === 'raised_idle') {
		const candidates = readings.filter((r) => r.condition === 'raised_idle');
		const withRpm = candidates.filter((r) => r.rpm !== undefined && r.rpm > 0);
		addSkipped(skipped, 'raised idle without a stated rpm', candidates.length - withRpm.length);
		rpm = mostCommonRpm(withRpm.map((r) => r.rpm as number));
		const tolerance = options.rpmTolerance ?? 0.1;
		const group = withRpm.filter(
			(r) => Math.abs((r.rpm as number) - (rpm as number)) <= tolerance * (rpm as number)
		);
		addSkipped(skipped, 'raised idle at another rpm', withRpm.length - group.length);
		points = group.map(rawPoint);
	} else {
		for (const r of readings) if (r.condition === kind) points.push(rawPoint(r));
	}
	return { kind, rpm, limit, points: sortedByTime(points), skipped, rule: '' };
}

function addSkipped(skipped: { reason: string; count: number }[], reason: string, count: number) {
	if (count > 0) skipped.push({ reason, count });
}

/**
 * The list itself when already in time order (the usual case), else the list stably sorted
 * in place — the same result as always sorting, without the comparisons.
 */
export function sortedByTime<T extends { at: Date }>(items: T[]): T[] {
	for (let i = 1; i < items.length; i++) {
		// Negated so an invalid date (NaN) also takes the sorting path.
		if (!(items[i].at.getTime() >= items[i - 1].at.getTime())) {
			return items.sort((a, b) => a.at.getTime() - b.at.getTime());
		}
	}
	return items;
}

/**
 * Picks the one series the forecast runs on: the first kind, in the order flow-normalised,
 * road load, raised idle, idle, that has at least `minPoints` points; if none has, the kind with
 * the most points (the forecast will then say there is not enough data).
 */
export function chooseComparableSeries(
	readings: readonly PressureReading[],
	options: SeriesOptions = {}
): ComparableSeries {
	const minPoints = options.minPoints ?? 8;
	// Built in order of preference, stopping at the first with enough points.
	const all: ComparableSeries[] = [];
	let enough: ComparableSeries | undefined;
	for (const kind of SERIES_KINDS) {
		const series = buildSeries(readings, kind, options);
		if (series.points.length >= minPoints) {
			enough = series;
			break;
		}
		all.push(series);
	}
	if (enough) {
		const passed = all.filter((s) => s.points.length > 0);
		const note = passed.length
			? ` (${passed.map((s) => `${s.points.length} ${SERIES_LABELS[s.kind]}`).join(', ')} too few)`
			: '';
		return {
			...enough,
			rule: `Uses ${SERIES_LABELS[enough.kind]}: the first kind with at least ${minPoints} readings${note}.`
		};
	}
	const most = all.reduce((best, s) => (s.points.length > best.points.length ? s : best), all[1]);
	return {
		...most,
		rule: `No kind of reading has ${minPoints} or more; ${SERIES_LABELS[most.kind]} has the most (${most.points.length}).`
	};
}

function rawPoint(r: PressureReading): SeriesPoint {
	return {
		at: r.at,
		odometerKm: r.odometerKm,
		deltaPMbar: r.deltaPMbar,
		measuredMbar: r.deltaPMbar
	};
}

/** The rpm (rounded to 50) stated most often; ties go to the higher count's first occurrence. */
function mostCommonRpm(rpms: number[]): number | undefined {
	const counts = new Map<number, number>();
	for (const rpm of rpms) {
		const key = Math.round(rpm / 50) * 50;
		counts.set(key, (counts.get(key) ?? 0) + 1);
	}
	let best: number | undefined;
	let bestCount = 0;
	for (const [key, count] of counts) {
		if (count > bestCount) {
			best = key;
			bestCount = count;
		}
	}
	return best;
}
