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
