import { describe, expect, it } from 'vitest';
import { forecastCrossing } from './forecast';
import type { PressureReading } from './series';
import { STATUS_LABELS, statusFromForecast, VAN_STATUSES } from './status';

const DAY_MS = 86_400_000;
const start = Date.UTC(2024, 0, 1);
function series(count: number, firstMbar: number, growthPerDay: number): PressureReading[] {
	return Array.from({ length: count }, (_, i) => ({
		at: new Date(start + i * 7 * DAY_MS),
		odometerKm: 10_000 + i * 600,
		deltaPMbar: firstMbar + growthPerDay * 7 * i + (i % 2 ? 1 : -1),
		condition: 'road_load' as const
	}));
}
function statusOf(readings: PressureReading[]) {
	const now = new Date(readings[readings.length - 1].at.getTime() + DAY_MS);
	return statusFromForecast(forecastCrossing({ readings, events: [], now }), now);
}

describe('statusFromForecast', () => {
	it('has a plain-English label for every status', () => {
		for (const status of VAN_STATUSES) expect(STATUS_LABELS[status].length).toBeGreaterThan(3);
	});

	it('grades by days to the expected crossing: 30 soon, 90 watch', () => {
		// Last reading at day 63; growth 2 mbar/day.
		expect(statusOf(series(10, 230, 1.5)).status).toBe('over_line');
		expect(statusOf(series(10, 150, 2)).status).toBe('crossing_soon'); // crosses day 75
		expect(statusOf(series(10, 100, 1.5)).status).toBe('watch'); // crosses day 133
		expect(statusOf(series(10, 100, 0.3)).status).toBe('healthy'); // crosses day 667
		expect(statusOf(series(3, 100, 1)).status).toBe('insufficient_data');
		expect(statusOf(series(10, 5, 0)).status).toBe('check_sensor');
	});

	it('honours custom horizons', () => {
		const readings = series(10, 100, 1.5);
		const now = new Date(readings[9].at.getTime() + DAY_MS);
		const f = forecastCrossing({ readings, events: [], now });
		expect(statusFromForecast(f, now, { soonDays: 80 }).status).toBe('crossing_soon');
		expect(statusFromForecast(f, now, { watchDays: 20 }).status).toBe('healthy');
	});
});
