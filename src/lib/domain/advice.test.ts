import { describe, expect, it } from 'vitest';
import { adviseDriver, adviseFleetManager } from './advice';
import { forecastCrossing } from './forecast';
import { simulateVanHistory, MIXED_PROFILE } from './simulate';
import { statusFromForecast } from './status';
import { summariseUsage, type Trip } from './usage';

const MINUTE = 60_000;
function trip(dayIso: string, hour: number, minutes: number, km: number): Trip {
	const start = new Date(`${dayIso}T${String(hour).padStart(2, '0')}:00:00Z`);
	return {
		start,
		end: new Date(start.getTime() + minutes * MINUTE),
		distanceKm: km,
		idleMinutes: 1,
		meanSpeedKmh: km / (minutes / 60)
	};
}

describe('adviseDriver', () => {
	it('counts the week and names the busiest day without a long run', () => {
		const trips = [
			trip('2024-03-04', 8, 30, 35), // Monday, long enough
			...[8, 9, 10, 11].map((h) => trip('2024-03-07', h, 10, 4)), // Thursday, four short hops
			trip('2024-03-05', 8, 10, 4) // Tuesday, one short hop
		];
		const usage = summariseUsage(trips, new Date('2024-03-09T00:00:00Z'));
		const [first] = adviseDriver(usage);
		expect(first.audience).toBe('driver');
		expect(first.text).toBe(
			'1 of your 6 trips last week was long enough for the filter to clean itself. One 25-minute run at steady speed on Thursday would help.'
		);
		expect(first.restsOn).toMatch(/6 trips/);
	});

	it('mentions interrupted regenerations from the forecast', () => {
		const h = simulateVanHistory({
			seed: 3,
			start: new Date('2024-01-01T00:00:00Z'),
			days: 300,
			profile: MIXED_PROFILE,
			regenFailsFromDay: 270
		});
		const now = new Date('2024-10-26T00:00:00Z');
		const forecast = forecastCrossing({ readings: h.readings, events: h.events, now });
		const items = adviseDriver(summariseUsage(h.trips, now), forecast);
		expect(items.some((i) => /stopped before it finished/.test(i.text))).toBe(true);
	});
});

describe('adviseFleetManager', () => {
	it('suggests a route change for a short-trip van and a booking date for one heading over', () => {
		const h = simulateVanHistory({
			seed: 4,
			start: new Date('2024-01-01T00:00:00Z'),
			days: 300,
			profile: { ...MIXED_PROFILE, shortTripShare: 0.95, tripsPerWorkingDay: 5 },
			regenFailsFromDay: 270
		});
		const now = new Date('2024-10-26T00:00:00Z');
		const forecast = forecastCrossing({ readings: h.readings, events: h.events, now });
		const status = statusFromForecast(forecast, now);
		const items = adviseFleetManager('VAN-07', summariseUsage(h.trips, now), forecast, status);
		expect(items.every((i) => i.audience === 'fleet_manager' && i.restsOn.length > 0)).toBe(true);
		expect(items.some((i) => /Rotate VAN-07/.test(i.text))).toBe(true);
		expect(items.some((i) => /Book VAN-07 in/.test(i.text))).toBe(true);
	});
});
