/**
 * Deterministic simulator of one diesel van's DPF history: trips, differential-pressure
 * readings and filter events, following the physical picture in DOMAIN.md — a soot saw-tooth
 * (loading, regeneration) on an ash baseline that only cleaning or replacement resets.
 *
 * Used for demo data and for known-truth tests of the forecast engine. All magnitudes are
 * illustrative defaults chosen to give plausible histories, not measured constants.
 */
import { createRandom, type Random } from './stats/random';
import type { EventKind, TestCondition } from './vocabulary';
import { volumetricFlowM3s } from './series';

const MS_PER_DAY = 86_400_000;
const MS_PER_MINUTE = 60_000;

/** How a van is used; all means, per working day or per trip. */
export interface DutyCycleProfile {
	/** Mean trips per working day (Poisson), e.g. 8 for parcel work, 3 for trades. */
	tripsPerWorkingDay: number;
	/** Share of trips that are short (0–1). */
	shortTripShare: number;
	/** Mean length of a short trip, km. */
	shortTripKm: number;
	/** Mean duration of a short trip, minutes. */
	shortTripMinutes: number;
	/** Mean length of a long trip, km. */
	longTripKm: number;
	/** Mean duration of a long trip, minutes. */
	longTripMinutes: number;
	/** Share of trip time spent idling (0–1). */
	idleShare: number;
	/** Working days per week, 1–7 (Monday first). */
	workingDaysPerWeek: number;
}

/** A mixed delivery round: half the trips short, some steady runs. */
export const MIXED_PROFILE: Readonly<DutyCycleProfile> = Object.freeze({
	tripsPerWorkingDay: 6,
	shortTripShare: 0.5,
	shortTripKm: 6,
	shortTripMinutes: 14,
	longTripKm: 40,
	longTripMinutes: 40,
	idleShare: 0.12,
	workingDaysPerWeek: 5
});

export interface SimulateVanOptions {
	/** Any integer; the same seed and options give the same history. */
	seed: number;
	/** Day 0 starts here (trips from about 07:00 after it, UTC). */
	start: Date;
	/** Days simulated (truth covers all of them). */
	days: number;
	/** Days whose readings, events and trips are returned (default: all); the rest feed only `truth`. */
	observedDays?: number;
	profile: DutyCycleProfile;
	/** Concern line for `truth.crossingAt`, road-load mbar (default 300). */
	concernMbar?: number;
	/** Road-load Δp of a clean filter at the reference flow, mbar (default 70). */
	cleanRoadLoadMbar?: number;
	/** Soot contribution at which the engine controller asks for an active regeneration, mbar (default 90). */
	regenTriggerMbar?: number;
	/** Soot left after a completed regeneration, mbar (default 3). */
	regenResidualMbar?: number;
	/**
	 * Known-truth mode: soot grows at exactly this rate per calendar day, evenly, instead of per
	 * trip (trips then only move the odometer, add ash and decide regenerations), mbar/day.
	 */
	sootMbarPerDay?: number;
	/** Gross soot added per km of warm, steady driving, mbar/km (default 0.12). */
	sootMbarPerKm?: number;
	/** Soot multiplier for short trips: cold engine, transients (default 2). */
	shortTripSootFactor?: number;
	/** Soot added per idling minute, mbar/min (default 0.04). */
	idleSootMbarPerMinute?: number;
	/** Share of a long trip's soot burnt as it forms by passive regeneration, 0–1 (default 0.5). */
	passiveBurnShare?: number;
	/** Engine making extra soot: multiplies all soot formation (default 1 = healthy). */
	sootMultiplier?: number;
	/** Driving minutes an active regeneration needs to complete (default 20). */
	regenMinutes?: number;
	/** Ash baseline creep, mbar per 1,000 km (default 0.5). */
	ashMbarPer1000Km?: number;
	/** Ash already in the filter at day 0, mbar (default 0). */
	initialAshMbar?: number;
	/** Soot at day 0, mbar (default: a seeded random point in the first cycle). */
	initialSootMbar?: number;
	/** Odometer at day 0, km (default 40,000). */
	initialOdometerKm?: number;
	/** Gaussian reading noise, sd in mbar (default 5). */
	noiseMbar?: number;
	/**
	 * Relative sd of the exhaust flow at a road-load test around the reference flow (default 0.01):
	 * a multiplicative error on top of `noiseMbar` (Δp ∝ Q).
	 */
	roadLoadFlowSpread?: number;
	/** Days between road-load readings (default 7; 0 = none). Each is jittered by ±1 day. */
	roadLoadEveryDays?: number;
	/** Days between idle readings (default 28; 0 = none). */
	idleEveryDays?: number;
	/** Days between raised-idle readings at 2,000 rpm (default 0 = none). */
	raisedIdleEveryDays?: number;
	/** Days between telemetry readings with flow data (default 0 = none). */
	telemetryEveryDays?: number;
	/** Filter cleaned off the vehicle on this day: ash and soot removed. */
	filterCleanedOnDay?: number;
	/** Filter replaced on this day. */
	filterReplacedOnDay?: number;
	/** Workshop service regenerations on these days. */
	serviceRegenOnDays?: number[];
	/** Sensor pipe leaks from this day: readings read a small fraction of the truth. */
	sensorLeakFromDay?: number;
	/** Sensor pipe repaired on this day. */
	sensorRepairedOnDay?: number;
	/** From this day every active regeneration is cut short (e.g. a fault inhibits it). */
	regenFailsFromDay?: number;
	/** Reference exhaust mass flow of the vehicle, kg/h (default 300). */
	referenceMassFlowKgH?: number;
	/** Reference exhaust temperature, °C (default 350). */
	referenceExhaustTempC?: number;
}

export interface SimulatedReading {
	at: Date;
	odometerKm: number;
	deltaPMbar: number;
	condition: TestCondition;
	rpm?: number;
	airMassFlowKgH?: number;
	exhaustTempC?: number;
	ambientPressureKpa?: number;
}

export interface SimulatedEvent {
	at: Date;
	kind: EventKind;
	odometerKm: number;
}

export interface SimulatedTrip {
	start: Date;
	end: Date;
	distanceKm: number;
	idleMinutes: number;
	meanSpeedKmh: number;
}

/** What the simulation knows and a forecast has to estimate. */
export interface SimulationTruth {
	/** Expected net soot growth (before regenerations), road-load mbar per calendar day. */
	sootGrowthMbarPerDay: number;
	/** Expected growth of the whole level within a cycle (soot plus ash), mbar per calendar day. */
	levelGrowthMbarPerDay: number;
	/** Expected net soot growth, mbar per 1,000 km. */
	sootGrowthMbarPer1000Km: number;
	/** Expected km per calendar day. */
	kmPerDay: number;
	ashMbarPer1000Km: number;
	noiseMbar: number;
	concernMbar: number;
	/** Noise-free road-load Δp at the end of each simulated day (index = day), mbar. */
	dailyRoadLoadMbar: number[];
	/** Odometer at the end of each simulated day, km. */
	dailyOdometerKm: number[];
	/** First moment the noise-free road-load Δp reaches the concern line, or null. */
	crossingAt: Date | null;
	/** Day index of `crossingAt` (fractional within the day), or null. */
	crossingDay: number | null;
	activeRegenCount: number;
	interruptedRegenCount: number;
	/** Road-load reference volumetric flow, m³/s (Q = ṁRT/p). */
	referenceFlowM3s: number;
}

export interface SimulatedVanHistory {
	readings: SimulatedReading[];
	events: SimulatedEvent[];
	trips: SimulatedTrip[];
	truth: SimulationTruth;
}

interface FilterState {
	sootMbar: number;
	ashMbar: number;
	odometerKm: number;
	regenPending: boolean;
}

/**
 * Simulates one van, day by day and trip by trip.
 *
 * Soot (in road-load mbar) grows per km, faster on short trips and when idling; long trips
 * burn half their own soot passively. When soot reaches the trigger, the controller attempts
 * an active regeneration on each following trip: a trip of at least `regenMinutes` completes
 * it (soot drops to the residual), a shorter one interrupts it (no drop). Ash adds a slow
 * baseline per km. Readings are the noise-free level scaled by the test condition's flow
 * (Darcy's law, Δp ∝ Q) plus Gaussian noise.
 *
 * Fast: 18 months of a busy van takes a few milliseconds. Pure and deterministic.
 */
export function simulateVanHistory(options: SimulateVanOptions): SimulatedVanHistory {
	const o = withDefaults(options);
	const random = createRandom(o.seed);
	const p = o.profile;
	const startMs = o.start.getTime();
	const referenceFlowM3s = volumetricFlowM3s(o.referenceMassFlowKgH, o.referenceExhaustTempC);

	const state: FilterState = {
		sootMbar: o.initialSootMbar ?? random.uniform() * o.regenTriggerMbar,
		ashMbar: o.initialAshMbar,
		odometerKm: o.initialOdometerKm,
		regenPending: false
	};
	const readings: SimulatedReading[] = [];
	const events: SimulatedEvent[] = [];
	const trips: SimulatedTrip[] = [];
	const dailyRoadLoadMbar: number[] = [];
	const dailyOdometerKm: number[] = [];
	const serviceDays = new Set(o.serviceRegenOnDays);
	let crossingMs: number | null = null;
	let activeRegenCount = 0;
	let interruptedRegenCount = 0;
	let clockMs = startMs;
	const levelMbar = (): number => o.cleanRoadLoadMbar + state.ashMbar + state.sootMbar;

	/** Moves the clock on, growing soot linearly when a daily rate is set, and notes the crossing. */
	const advance = (toMs: number, change?: () => void): void => {
		const before = levelMbar();
		if (o.sootMbarPerDay !== undefined) {
			state.sootMbar += (o.sootMultiplier * o.sootMbarPerDay * (toMs - clockMs)) / MS_PER_DAY;
		}
		change?.();
		const after = levelMbar();
		if (crossingMs === null && after >= o.concernMbar && before < o.concernMbar) {
			crossingMs = clockMs + ((o.concernMbar - before) / (after - before)) * (toMs - clockMs);
		}
		clockMs = Math.max(clockMs, toMs);
		if (state.sootMbar >= o.regenTriggerMbar) state.regenPending = true;
	};

	const next = {
		road: o.roadLoadEveryDays > 0 ? 1 + Math.floor(random.uniform() * o.roadLoadEveryDays) : -1,
		idle: o.idleEveryDays > 0 ? 1 + Math.floor(random.uniform() * o.idleEveryDays) : -1,
		raised:
			o.raisedIdleEveryDays > 0 ? 1 + Math.floor(random.uniform() * o.raisedIdleEveryDays) : -1,
		telemetry: o.telemetryEveryDays > 0 ? 0 : -1
	};

	for (let day = 0; day < o.days; day++) {
		const dayMs = startMs + day * MS_PER_DAY;
		// Later days still draw every random number, so `observedDays` never changes the truth.
		const observed = day < o.observedDays;
		const emit = (event: SimulatedEvent): void => {
			if (observed) events.push(event);
		};

		// Workshop work happens first thing in the morning.
		const morningMs = dayMs + 7 * 60 * MS_PER_MINUTE;
		advance(morningMs);
		if (day === o.filterCleanedOnDay || day === o.filterReplacedOnDay) {
			const replaced = day === o.filterReplacedOnDay;
			// Off-vehicle cleaning removes most, not all, of the ash.
			state.ashMbar = replaced ? 0 : state.ashMbar * 0.1;
			state.sootMbar = 0;
			state.regenPending = false;
			const kind = replaced ? 'filter_replacement' : 'filter_cleaning';
			emit({ at: new Date(morningMs), kind, odometerKm: round1(state.odometerKm) });
		}
		if (serviceDays.has(day)) {
			state.sootMbar = o.regenResidualMbar;
			state.regenPending = false;
			emit({
				at: new Date(morningMs),
				kind: 'regen_service',
				odometerKm: round1(state.odometerKm)
			});
		}
		if (day === o.sensorRepairedOnDay) {
			emit({
				at: new Date(morningMs),
				kind: 'sensor_repair',
				odometerKm: round1(state.odometerKm)
			});
		}

		let tripStartMs = morningMs + random.uniform() * 60 * MS_PER_MINUTE;
		let lastTripEndMs = morningMs;
		let interruptedToday = false;
		if (isWorkingDay(dayMs, p.workingDaysPerWeek)) {
			const tripCount = Math.max(1, random.poisson(p.tripsPerWorkingDay));
			for (let i = 0; i < tripCount; i++) {
				const trip = drawTrip(random, p, tripStartMs);
				const endMs = trip.end.getTime();
				lastTripEndMs = endMs;
				tripStartMs = endMs + (10 + random.uniform() * 40) * MS_PER_MINUTE;
				if (observed) trips.push(trip);
				const drivingMinutes = (endMs - trip.start.getTime()) / MS_PER_MINUTE;
				const attempting = state.regenPending;
				advance(trip.start.getTime());
				advance(endMs, () => addTripSoot(state, o, trip, drivingMinutes));
				if (!attempting) continue;
				if (drivingMinutes >= o.regenMinutes && day < o.regenFailsFromDay) {
					state.sootMbar = o.regenResidualMbar;
					state.regenPending = false;
					activeRegenCount++;
					emit({ at: trip.end, kind: 'regen_active', odometerKm: round1(state.odometerKm) });
				} else if (!interruptedToday) {
					// Logged once a day: the controller reports the aborted attempt, then retries.
					interruptedToday = true;
					interruptedRegenCount++;
					emit({ at: trip.end, kind: 'regen_interrupted', odometerKm: round1(state.odometerKm) });
				}
			}
		}

		// Readings (and the truth record) come after the day's driving.
		const readingMs = Math.max(
			dayMs + 17.5 * 60 * MS_PER_MINUTE,
			lastTripEndMs + 10 * MS_PER_MINUTE
		);
		advance(readingMs);
		dailyRoadLoadMbar.push(levelMbar());
		dailyOdometerKm.push(state.odometerKm);

		const leaking =
			day >= o.sensorLeakFromDay &&
			!(o.sensorRepairedOnDay !== undefined && day >= o.sensorRepairedOnDay);
		const take = (
			condition: TestCondition,
			flowRatio: number,
			offsetMinutes: number,
			extra: Partial<SimulatedReading>
		) => {
			const trueMbar = levelMbar() * flowRatio;
			const noise = random.normal();
			// A split pipe bleeds the upstream pressure away: the sensor sees a small fraction.
			const seenMbar = leaking ? trueMbar * 0.08 + noise * 1.5 : trueMbar + noise * o.noiseMbar;
			if (!observed) return;
			readings.push({
				at: new Date(readingMs + offsetMinutes * MS_PER_MINUTE),
				odometerKm: round1(state.odometerKm),
				deltaPMbar: round1(Math.max(0, seenMbar)),
				condition,
				...extra
			});
		};
		if (day === next.road) {
			// A road-load test lands within a per cent or so of the reference flow (by default).
			take('road_load', 1 + random.normal() * o.roadLoadFlowSpread, 0, {
				rpm: Math.round(2500 + random.normal() * 40)
			});
			next.road = day + Math.max(1, o.roadLoadEveryDays + Math.round(random.uniform() * 2 - 1));
		}
		if (day === next.idle) {
			take('idle', 0.3, 5, { rpm: Math.round(800 + random.normal() * 15) });
			next.idle = day + o.idleEveryDays;
		}
		if (day === next.raised) {
			take('raised_idle', 0.55, 10, { rpm: 2000 });
			next.raised = day + o.raisedIdleEveryDays;
		}
		if (day === next.telemetry) {
			const airMassFlowKgH = 120 + random.uniform() * 330;
			const exhaustTempC = 220 + random.uniform() * 230;
			const ambientPressureKpa = 97 + random.uniform() * 5;
			const flowM3s = volumetricFlowM3s(airMassFlowKgH, exhaustTempC, ambientPressureKpa);
			take('telemetry', flowM3s / referenceFlowM3s, 15, {
				rpm: Math.round(1200 + (airMassFlowKgH - 120) * 6),
				airMassFlowKgH: round1(airMassFlowKgH),
				exhaustTempC: round1(exhaustTempC),
				ambientPressureKpa: Math.round(ambientPressureKpa * 100) / 100
			});
			next.telemetry = day + o.telemetryEveryDays;
		}
	}

	const expected = expectedGrowth(o);
	const crossingDay = crossingMs === null ? null : (crossingMs - startMs) / MS_PER_DAY;
	return {
		readings,
		events,
		trips,
		truth: {
			...expected,
			ashMbarPer1000Km: o.ashMbarPer1000Km,
			noiseMbar: o.noiseMbar,
			concernMbar: o.concernMbar,
			dailyRoadLoadMbar,
			dailyOdometerKm,
			crossingAt: crossingMs === null ? null : new Date(crossingMs),
			crossingDay,
			activeRegenCount,
			interruptedRegenCount,
			referenceFlowM3s
		}
	};
}

type OptionalKeys =
	| 'initialSootMbar'
	| 'sensorRepairedOnDay'
	| 'filterCleanedOnDay'
	| 'filterReplacedOnDay'
	| 'sootMbarPerDay';
type ResolvedOptions = Required<Omit<SimulateVanOptions, OptionalKeys>> &
	Pick<SimulateVanOptions, OptionalKeys>;

function withDefaults(options: SimulateVanOptions): ResolvedOptions {
	return {
		observedDays: options.days,
		concernMbar: 300,
		cleanRoadLoadMbar: 70,
		regenTriggerMbar: 90,
		regenResidualMbar: 3,
		sootMbarPerKm: 0.12,
		shortTripSootFactor: 2,
		idleSootMbarPerMinute: 0.04,
		passiveBurnShare: 0.5,
		sootMultiplier: 1,
		regenMinutes: 20,
		ashMbarPer1000Km: 0.5,
		initialAshMbar: 0,
		initialOdometerKm: 40_000,
		noiseMbar: 5,
		roadLoadEveryDays: 7,
		roadLoadFlowSpread: 0.01,
		idleEveryDays: 28,
		raisedIdleEveryDays: 0,
		telemetryEveryDays: 0,
		serviceRegenOnDays: [],
		sensorLeakFromDay: Number.POSITIVE_INFINITY,
		regenFailsFromDay: Number.POSITIVE_INFINITY,
		referenceMassFlowKgH: 300,
		referenceExhaustTempC: 350,
		...stripUndefined(options)
	};
}

function stripUndefined<T extends object>(value: T): T {
	return Object.fromEntries(Object.entries(value).filter(([, v]) => v !== undefined)) as T;
}

/** Monday-first working week in UTC: 5 → Monday to Friday. */
function isWorkingDay(dayMs: number, workingDaysPerWeek: number): boolean {
	const mondayFirst = (new Date(dayMs).getUTCDay() + 6) % 7;
	return mondayFirst < workingDaysPerWeek;
}

function drawTrip(random: Random, p: DutyCycleProfile, startMs: number): SimulatedTrip {
	const isShort = random.uniform() < p.shortTripShare;
	const scale = random.lognormalMeanOne(0.35);
	const distanceKm = (isShort ? p.shortTripKm : p.longTripKm) * scale;
	// Longer-than-usual trips take proportionally a little less than their distance suggests.
	const minutes =
		(isShort ? p.shortTripMinutes : p.longTripMinutes) *
		scale ** 0.85 *
		random.lognormalMeanOne(0.1);
	const idleMinutes = minutes * Math.min(0.95, p.idleShare * random.lognormalMeanOne(0.3));
	return {
		start: new Date(startMs),
		end: new Date(startMs + minutes * MS_PER_MINUTE),
		distanceKm: round1(distanceKm),
		idleMinutes: round1(idleMinutes),
		meanSpeedKmh: round1(distanceKm / (minutes / 60))
	};
}

function addTripSoot(
	state: FilterState,
	o: ResolvedOptions,
	trip: SimulatedTrip,
	minutes: number
): void {
	const steady = minutes >= o.regenMinutes;
	const perKm = o.sootMbarPerKm * (steady ? 1 - o.passiveBurnShare : o.shortTripSootFactor);
	if (o.sootMbarPerDay === undefined) {
		state.sootMbar +=
			o.sootMultiplier * (trip.distanceKm * perKm + trip.idleMinutes * o.idleSootMbarPerMinute);
	}
	state.ashMbar += (trip.distanceKm / 1000) * o.ashMbarPer1000Km;
	state.odometerKm += trip.distanceKm;
}

/** Expected soot growth from the profile (means of the trip draws above). */
function expectedGrowth(o: ResolvedOptions) {
	const p = o.profile;
	const perTrip = (km: number, minutes: number, perKm: number) =>
		o.sootMultiplier * (km * perKm + minutes * p.idleShare * o.idleSootMbarPerMinute);
	// Classification by duration, as in the simulation: a long trip's mean sits well above regenMinutes.
	const shortSoot = perTrip(
		p.shortTripKm,
		p.shortTripMinutes,
		o.sootMbarPerKm * o.shortTripSootFactor
	);
	const longSoot = perTrip(
		p.longTripKm,
		p.longTripMinutes,
		o.sootMbarPerKm * (1 - o.passiveBurnShare)
	);
	const tripsPerDay = (p.tripsPerWorkingDay * Math.min(7, p.workingDaysPerWeek)) / 7;
	const sootPerTrip = p.shortTripShare * shortSoot + (1 - p.shortTripShare) * longSoot;
	const kmPerTrip = p.shortTripShare * p.shortTripKm + (1 - p.shortTripShare) * p.longTripKm;
	const sootGrowthMbarPerDay =
		o.sootMbarPerDay !== undefined
			? o.sootMultiplier * o.sootMbarPerDay
			: tripsPerDay * sootPerTrip;
	const kmPerDay = tripsPerDay * kmPerTrip;
	return {
		sootGrowthMbarPerDay,
		levelGrowthMbarPerDay: sootGrowthMbarPerDay + (kmPerDay / 1000) * o.ashMbarPer1000Km,
		kmPerDay,
		sootGrowthMbarPer1000Km: kmPerDay > 0 ? (sootGrowthMbarPerDay / kmPerDay) * 1000 : 0
	};
}

function round1(value: number): number {
	return Math.round(value * 10) / 10;
}
