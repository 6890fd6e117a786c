/**
 * Usage profile from trip logs: how much of a van's driving lets the filter regenerate.
 */

/** A trip as the engine sees it (from telematics or a logbook). */
export interface Trip {
	start: Date;
	end: Date;
	distanceKm: number;
	idleMinutes: number;
	meanSpeedKmh: number;
}

export interface UsageOptions {
	/** A trip shorter than this is short, minutes (default 15). */
	shortTripMinutes?: number;
	/** …or shorter than this, km (default 10). */
	shortTripKm?: number;
	/** A regeneration-capable drive lasts at least this long on the move, minutes (default 20). */
	regenDriveMinutes?: number;
	/** …at a moving average of at least this, km/h (default 45): a proxy for steady road speed. */
	steadySpeedKmh?: number;
	/** Days looked back from `now` (default 28). */
	windowDays?: number;
}

/**
 * Defaults. Short trips "roughly under 15 minutes or 10 km" and a "sustained drive of 20+
 * minutes at steady road speed" — check value: common trade practice, no published source.
 * 45 km/h as the moving-average proxy for steady road speed is Sootcast's own choice.
 */
export const USAGE_DEFAULTS: Readonly<Required<UsageOptions>> = Object.freeze({
	shortTripMinutes: 15,
	shortTripKm: 10,
	regenDriveMinutes: 20,
	steadySpeedKmh: 45,
	windowDays: 28
});

const MS_PER_MINUTE = 60_000;
const MS_PER_DAY = 86_400_000;

/** Trip duration in minutes. */
export function tripMinutes(trip: Trip): number {
	return (trip.end.getTime() - trip.start.getTime()) / MS_PER_MINUTE;
}

/** True when a trip is short: under `shortTripMinutes` or under `shortTripKm`. */
export function isShortTrip(trip: Trip, options: UsageOptions = {}): boolean {
	const o = { ...USAGE_DEFAULTS, ...options };
	return tripMinutes(trip) < o.shortTripMinutes || trip.distanceKm < o.shortTripKm;
}

/**
 * True when a trip could let an active regeneration finish: at least `regenDriveMinutes` on
 * the move (duration minus idling) at a moving average of at least `steadySpeedKmh`.
 */
export function isRegenCapable(trip: Trip, options: UsageOptions = {}): boolean {
	const o = { ...USAGE_DEFAULTS, ...options };
	const movingMinutes = tripMinutes(trip) - trip.idleMinutes;
	if (movingMinutes < o.regenDriveMinutes) return false;
	return trip.distanceKm / (movingMinutes / 60) >= o.steadySpeedKmh;
}

export interface WeekUsage {
	/** Start of the 7-day block (counted back from `now`). */
	from: Date;
	trips: number;
	shortTrips: number;
	regenCapableDrives: number;
	/** Trips per weekday, Monday first (UTC). */
	tripsByWeekday: number[];
	/** Regeneration-capable drives per weekday, Monday first (UTC). */
	regenCapableByWeekday: number[];
}

export interface UsageSummary {
	from: Date;
	to: Date;
	windowDays: number;
	trips: number;
	shortTrips: number;
	/** 0–1; null without trips. */
	shortTripShare: number | null;
	regenCapableDrives: number;
	regenCapablePerWeek: number;
	/** Idle minutes over trip minutes, 0–1; null without trips. */
	idleShare: number | null;
	idleMinutes: number;
	totalKm: number;
	kmPerDay: number;
	meanTripKm: number | null;
	meanTripMinutes: number | null;
	/** 7-day blocks ending at `now`, most recent last. */
	weeks: WeekUsage[];
	options: Required<UsageOptions>;
}

/**
 * Summarises the trips that started within `windowDays` before `now`.
 * @param now end of the window (trips after it are ignored)
 */
export function summariseUsage(
	trips: readonly Trip[],
	now: Date,
	options: UsageOptions = {}
): UsageSummary {
	const o = { ...USAGE_DEFAULTS, ...options };
	const toMs = now.getTime();
	const fromMs = toMs - o.windowDays * MS_PER_DAY;
	const weekCount = Math.max(1, Math.ceil(o.windowDays / 7));
	const weeks: WeekUsage[] = Array.from({ length: weekCount }, (_, i) => ({
		from: new Date(toMs - (weekCount - i) * 7 * MS_PER_DAY),
		trips: 0,
		shortTrips: 0,
		regenCapableDrives: 0,
		tripsByWeekday: [0, 0, 0, 0, 0, 0, 0],
		regenCapableByWeekday: [0, 0, 0, 0, 0, 0, 0]
	}));
	let count = 0;
	let shortTrips = 0;
	let regenCapableDrives = 0;
	let idleMinutes = 0;
	let minutes = 0;
	let totalKm = 0;
	for (const trip of trips) {
		const startMs = trip.start.getTime();
		if (startMs < fromMs || startMs > toMs) continue;
		const short = isShortTrip(trip, o);
		const capable = isRegenCapable(trip, o);
		count++;
		if (short) shortTrips++;
		if (capable) regenCapableDrives++;
		idleMinutes += trip.idleMinutes;
		minutes += tripMinutes(trip);
		totalKm += trip.distanceKm;
		const weekIndex = weekCount - 1 - Math.floor((toMs - startMs) / (7 * MS_PER_DAY));
		const week = weeks[weekIndex];
		if (week) {
			const weekday = (trip.start.getUTCDay() + 6) % 7;
			week.trips++;
			week.tripsByWeekday[weekday]++;
			if (short) week.shortTrips++;
			if (capable) {
				week.regenCapableDrives++;
				week.regenCapableByWeekday[weekday]++;
			}
		}
	}
	return {
		from: new Date(fromMs),
		to: now,
		windowDays: o.windowDays,
		trips: count,
		shortTrips,
		shortTripShare: count ? shortTrips / count : null,
		regenCapableDrives,
		regenCapablePerWeek: (regenCapableDrives * 7) / o.windowDays,
		idleShare: minutes > 0 ? idleMinutes / minutes : null,
		idleMinutes,
		totalKm,
		kmPerDay: totalKm / o.windowDays,
		meanTripKm: count ? totalKm / count : null,
		meanTripMinutes: count ? minutes / count : null,
		weeks,
		options: o
	};
}
