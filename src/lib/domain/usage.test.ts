import { describe, expect, it } from 'vitest';
import { isRegenCapable, isShortTrip, summariseUsage, type Trip } from './usage';

const MINUTE = 60_000;
function trip(dayIso: string, hour: number, minutes: number, km: number, idleMinutes = 0): Trip {
	const start = new Date(`${dayIso}T${String(hour).padStart(2, '0')}:00:00Z`);
	return {
		start,
		end: new Date(start.getTime() + minutes * MINUTE),
		distanceKm: km,
		idleMinutes,
		meanSpeedKmh: km / (minutes / 60)
	};
}

describe('trip classes', () => {
	// check value: common trade practice, no published source — short under 15 min or 10 km;
	// 20+ minutes at steady road speed lets a regeneration finish.
	it('calls a trip short under 15 minutes or under 10 km', () => {
		expect(isShortTrip(trip('2024-03-04', 8, 14, 12))).toBe(true);
		expect(isShortTrip(trip('2024-03-04', 8, 30, 9))).toBe(true);
		expect(isShortTrip(trip('2024-03-04', 8, 15, 10))).toBe(false);
	});

	it('needs 20 moving minutes at steady speed for a regeneration-capable drive', () => {
		expect(isRegenCapable(trip('2024-03-04', 8, 25, 30))).toBe(true);
		expect(isRegenCapable(trip('2024-03-04', 8, 25, 30, 6))).toBe(false); // 19 min moving
		expect(isRegenCapable(trip('2024-03-04', 8, 40, 15))).toBe(false); // 22.5 km/h
	});
});

describe('summariseUsage', () => {
	it('counts the window and the last week by weekday', () => {
		const trips = [
			trip('2024-03-04', 8, 10, 4, 2), // Monday, short
			trip('2024-03-04', 9, 30, 35, 3), // Monday, regeneration-capable
			trip('2024-03-07', 8, 12, 5, 4), // Thursday, short
			trip('2024-03-07', 9, 12, 5, 1), // Thursday, short
			trip('2024-02-01', 9, 60, 80) // outside the 28-day window
		];
		const usage = summariseUsage(trips, new Date('2024-03-09T00:00:00Z'));
		expect(usage.trips).toBe(4);
		expect(usage.shortTrips).toBe(3);
		expect(usage.shortTripShare).toBe(0.75);
		expect(usage.regenCapableDrives).toBe(1);
		expect(usage.regenCapablePerWeek).toBeCloseTo(0.25, 12);
		expect(usage.idleShare).toBeCloseTo(10 / 64, 12);
		expect(usage.totalKm).toBe(49);
		expect(usage.meanTripMinutes).toBe(16);
		const lastWeek = usage.weeks[usage.weeks.length - 1];
		expect(lastWeek.trips).toBe(4);
		expect(lastWeek.tripsByWeekday).toEqual([2, 0, 0, 2, 0, 0, 0]);
		expect(lastWeek.regenCapableByWeekday).toEqual([1, 0, 0, 0, 0, 0, 0]);
	});

	it('gives nulls rather than dividing by zero without trips', () => {
		const usage = summariseUsage([], new Date('2024-03-09T00:00:00Z'));
		expect(usage.shortTripShare).toBeNull();
		expect(usage.idleShare).toBeNull();
		expect(usage.meanTripKm).toBeNull();
	});
});
