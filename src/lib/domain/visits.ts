/**
 * Preventive visits: the kinds a workshop offers, their usual length, and the wall-clock
 * arithmetic for opening hours. Pure: no I/O, no clock.
 */
export const VISIT_KINDS = [
	'inspection',
	'sensor_check',
	'service_regen',
	'off_vehicle_cleaning',
	'replacement'
] as const;
export type VisitKind = (typeof VISIT_KINDS)[number];

export const VISIT_KIND_LABEL: Record<VisitKind, string> = {
	inspection: 'Inspection with back-pressure test',
	sensor_check: 'Sensor and pipe check',
	service_regen: 'Service regeneration',
	off_vehicle_cleaning: 'Off-vehicle filter cleaning',
	replacement: 'Filter replacement'
};

/** Default lengths when a workshop has not set its own (common trade practice, no published source). */
export const DEFAULT_VISIT_MINUTES: Record<VisitKind, number> = {
	inspection: 60,
	sensor_check: 60,
	service_regen: 120,
	off_vehicle_cleaning: 240,
	replacement: 180
};

/** Booking states in which the visit holds a bay. */
export const OPEN_BOOKING_STATES = ['requested', 'proposed', 'confirmed'] as const;
export type OpenBookingState = (typeof OPEN_BOOKING_STATES)[number];

/** 'HH:MM' → minutes after midnight. */
export function minutesOfDay(hhmm: string): number {
	const [h, m] = hhmm.split(':').map(Number);
	return h * 60 + m;
}

export const WEEKDAY_NAMES = [
	'Mondays',
	'Tuesdays',
	'Wednesdays',
	'Thursdays',
	'Fridays',
	'Saturdays',
	'Sundays'
];

const DAY_MS = 86_400_000;
const utcMidnight = (at: Date) => Date.UTC(at.getUTCFullYear(), at.getUTCMonth(), at.getUTCDate());

/** A suggested visit window; `urgent` when the van should come in as soon as possible. */
export interface VisitWindow {
	from: Date;
	to: Date;
	urgent: boolean;
}

/**
 * The window to suggest for a van's visit: from tomorrow to the day before the forecast's
 * earliest crossing, at most four weeks; four weeks when no crossing is forecast. A van already
 * over the line, or whose crossing is too close for a window of three days to end before it, is
 * `urgent`: the next three days, to be read as "as soon as possible", never as a date after the
 * crossing. Dates are UTC midnights. A product rule, not a published formula.
 */
export function suggestedVisitWindow(
	now: Date,
	forecast: { crossingEarliest: Date | null; overLine: boolean }
): VisitWindow {
	const from = utcMidnight(now) + DAY_MS;
	const soonest = { from: new Date(from), to: new Date(from + 2 * DAY_MS), urgent: true };
	if (forecast.overLine) return soonest;
	if (!forecast.crossingEarliest)
		return { from: new Date(from), to: new Date(from + 28 * DAY_MS), urgent: false };
	const dayBefore = utcMidnight(forecast.crossingEarliest) - DAY_MS;
	if (dayBefore < from + 2 * DAY_MS) return soonest;
	return {
		from: new Date(from),
		to: new Date(Math.min(from + 28 * DAY_MS, dayBefore)),
		urgent: false
	};
}
