import { describe, expect, it } from 'vitest';
import { forecastCrossing } from './forecast';

describe('a trend that barely rises', () => {
	it('reports no crossing instead of failing on a date beyond the calendar', () => {
		const now = new Date(Date.UTC(2026, 11, 1));
		// Twelve weekly road-load readings rising by a billionth of a millibar a week: the line
		// would be reached after more days than a JavaScript Date can represent (±8.64e15 ms).
		const readings = Array.from({ length: 12 }, (_, i) => ({
			at: new Date(now.getTime() - (12 - i) * 7 * 86_400_000),
			odometerKm: 50_000 + i * 500,
			deltaPMbar: 150 + i * 1e-9,
			condition: 'road_load' as const
		}));
		const forecast = forecastCrossing({ readings, events: [], now });
		expect(['no_crossing', 'insufficient_data']).toContain(forecast.state);
		expect(forecast.crossing.expected).toBeNull();
		expect(forecast.explanation).not.toMatch(/Invalid/);
	});
});
