import { describe, expect, it } from 'vitest';
import { MIXED_PROFILE, simulateVanHistory, type SimulateVanOptions } from './simulate';

const start = new Date('2024-01-01T00:00:00Z');
const base: SimulateVanOptions = { seed: 11, start, days: 365, profile: MIXED_PROFILE };

describe('simulateVanHistory', () => {
	it('gives the same history for the same seed and a different one for another seed', () => {
		const a = simulateVanHistory(base);
		const b = simulateVanHistory(base);
		const c = simulateVanHistory({ ...base, seed: 12 });
		expect(b).toEqual(a);
		expect(c.readings.map((r) => r.deltaPMbar)).not.toEqual(a.readings.map((r) => r.deltaPMbar));
	});

	it('returns only the observed days but keeps the same truth', () => {
		const full = simulateVanHistory(base);
		const part = simulateVanHistory({ ...base, observedDays: 200 });
		const cutMs = start.getTime() + 200 * 86_400_000;
		expect(part.truth).toEqual(full.truth);
		expect(part.readings).toEqual(full.readings.filter((r) => r.at.getTime() < cutMs));
		expect(part.trips.every((t) => t.start.getTime() < cutMs)).toBe(true);
	});

	it('keeps time and odometer moving forward', () => {
		const h = simulateVanHistory(base);
		for (let i = 1; i < h.readings.length; i++) {
			expect(h.readings[i].at.getTime()).toBeGreaterThan(h.readings[i - 1].at.getTime());
			expect(h.readings[i].odometerKm).toBeGreaterThanOrEqual(h.readings[i - 1].odometerKm);
		}
		for (const t of h.trips) {
			expect(t.end.getTime()).toBeGreaterThan(t.start.getTime());
			expect(t.distanceKm).toBeGreaterThan(0);
			expect(t.idleMinutes).toBeGreaterThanOrEqual(0);
		}
	});

	it('drops the level at each completed active regeneration', () => {
		const h = simulateVanHistory(base);
		const { dailyRoadLoadMbar } = h.truth;
		expect(h.truth.activeRegenCount).toBeGreaterThan(5);
		const dayOf = (at: Date) => Math.floor((at.getTime() - start.getTime()) / 86_400_000);
		const regenDays = new Set(
			h.events.filter((e) => e.kind === 'regen_active').map((e) => dayOf(e.at))
		);
		let drops = 0;
		for (const day of regenDays) {
			if (day > 0 && dailyRoadLoadMbar[day] < dailyRoadLoadMbar[day - 1] - 30) drops++;
		}
		// Most regeneration days end lower than the day before (a few regenerate early in a day of heavy loading).
		expect(drops / regenDays.size).toBeGreaterThan(0.8);
	});

	it('lets soot climb past the line when regenerations stop completing', () => {
		const h = simulateVanHistory({ ...base, days: 540, regenFailsFromDay: 200 });
		expect(h.truth.crossingDay).not.toBeNull();
		expect(h.truth.crossingDay as number).toBeGreaterThan(200);
		expect(h.events.some((e) => e.kind === 'regen_interrupted')).toBe(true);
	});

	it('reads implausibly low through a leaking sensor pipe', () => {
		const h = simulateVanHistory({ ...base, sensorLeakFromDay: 180 });
		const road = h.readings.filter((r) => r.condition === 'road_load');
		const cutMs = start.getTime() + 180 * 86_400_000;
		const before = road.filter((r) => r.at.getTime() < cutMs).map((r) => r.deltaPMbar);
		const after = road.filter((r) => r.at.getTime() >= cutMs).map((r) => r.deltaPMbar);
		expect(Math.min(...before)).toBeGreaterThan(50);
		expect(Math.max(...after)).toBeLessThan(30);
	});

	it('resets the ash baseline when the filter is cleaned', () => {
		const h = simulateVanHistory({ ...base, initialAshMbar: 120, filterCleanedOnDay: 100 });
		expect(h.events.some((e) => e.kind === 'filter_cleaning')).toBe(true);
		const level = h.truth.dailyRoadLoadMbar;
		expect(level[101]).toBeLessThan(level[99] - 100);
	});

	it('grows soot exactly linearly in known-truth mode', () => {
		const h = simulateVanHistory({
			...base,
			sootMbarPerDay: 2,
			regenTriggerMbar: 1e9,
			initialSootMbar: 0,
			ashMbarPer1000Km: 0
		});
		const level = h.truth.dailyRoadLoadMbar;
		// Same reading time every day when trips end before 17:30, so the steps are 2 mbar.
		const steps = level.slice(1).map((v, i) => v - level[i]);
		const median = [...steps].sort((a, b) => a - b)[steps.length >> 1];
		expect(median).toBeCloseTo(2, 6);
		// From 70 mbar at midnight of day 0, 2 mbar/day reaches 300 mbar after 115 days.
		expect(h.truth.crossingDay).toBeCloseTo(115, 6);
	});

	it('simulates 40 vans over 18 months within a second', () => {
		const t0 = performance.now();
		for (let seed = 0; seed < 40; seed++) {
			simulateVanHistory({ ...base, seed, days: 548, telemetryEveryDays: 2 });
		}
		expect(performance.now() - t0).toBeLessThan(2000);
	});
});
