/**
 * Sootcast's status words for a van, derived from its crossing forecast and `now`.
 */
import type { CrossingForecast } from './forecast';

export const VAN_STATUSES = [
	'over_line',
	'crossing_soon',
	'watch',
	'check_sensor',
	'insufficient_data',
	'healthy'
] as const;
export type VanStatus = (typeof VAN_STATUSES)[number];

/** Short labels for badges (always shown with the word, never colour alone). */
export const STATUS_LABELS: Readonly<Record<VanStatus, string>> = Object.freeze({
	over_line: 'Over the line',
	crossing_soon: 'Crossing soon',
	watch: 'Keep an eye on it',
	check_sensor: 'Check the sensor',
	insufficient_data: 'Not enough data',
	healthy: 'Healthy'
});

/** One plain sentence per status, for tooltips and summaries. */
export const STATUS_DESCRIPTIONS: Readonly<Record<VanStatus, string>> = Object.freeze({
	over_line: 'Δp is at or above the concern line: book the van in.',
	crossing_soon: 'Δp is expected to reach the concern line soon: plan a workshop visit.',
	watch: 'Δp could reach the concern line within the next few months.',
	check_sensor: 'The readings are implausibly low under load: check the sensor and its pipes.',
	insufficient_data: 'Too few recent comparable readings to forecast.',
	healthy: 'No crossing of the concern line expected within the horizon.'
});

/** Most urgent first, for sorting fleet lists. */
export const STATUS_RANK: Readonly<Record<VanStatus, number>> = Object.freeze({
	over_line: 0,
	crossing_soon: 1,
	check_sensor: 2,
	watch: 3,
	insufficient_data: 4,
	healthy: 5
});

export interface StatusOptions {
	/** Expected crossing within this many days → `crossing_soon` (default 30). */
	soonDays?: number;
	/** Expected crossing, or the earliest likely one, within this many days → `watch` (default 90). */
	watchDays?: number;
}

export interface VanStatusResult {
	status: VanStatus;
	label: string;
	description: string;
	/** Days from `now` to the expected crossing, or null. */
	daysToCrossing: number | null;
}

/**
 * Status of a van from its forecast.
 * - `over_line`, `check_sensor` (implausibly low readings), `insufficient_data` follow the
 *   forecast state;
 * - `crossing_soon`: expected crossing within `soonDays` (default 30);
 * - `watch`: expected crossing within `watchDays` (default 90), or the earliest likely
 *   crossing within it even when the expected one is later;
 * - `healthy`: otherwise.
 * The 30/90-day defaults are Sootcast's own planning horizons (a month to book a workshop, a
 * quarter to change routes), no published source.
 */
export function statusFromForecast(
	forecast: CrossingForecast,
	now: Date,
	options: StatusOptions = {}
): VanStatusResult {
	const soonDays = options.soonDays ?? 30;
	const watchDays = options.watchDays ?? 90;
	const daysFromNow = (at: Date | null) =>
		at === null ? null : (at.getTime() - now.getTime()) / 86_400_000;
	const daysToCrossing = daysFromNow(forecast.crossing.expected);
	const earliest = daysFromNow(forecast.crossing.earliest);
	let status: VanStatus;
	switch (forecast.state) {
		case 'over_line':
			status = 'over_line';
			break;
		case 'implausible_readings':
			status = 'check_sensor';
			break;
		case 'insufficient_data':
			status = 'insufficient_data';
			break;
		default:
			if (daysToCrossing !== null && daysToCrossing <= soonDays) status = 'crossing_soon';
			else if (
				(daysToCrossing !== null && daysToCrossing <= watchDays) ||
				(earliest !== null && earliest <= watchDays)
			) {
				status = 'watch';
			} else status = 'healthy';
	}
	return {
		status,
		label: STATUS_LABELS[status],
		description: STATUS_DESCRIPTIONS[status],
		daysToCrossing
	};
}
