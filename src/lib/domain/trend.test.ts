import { describe, expect, it } from 'vitest';
import type { SeriesPoint } from './series';
import { estimateKmPerDay, findEpoch, fitGrowth, splitIntoCycles, type FilterEvent } from './trend';

const DAY_MS = 86_400_000;
const t0 = Date.UTC(2024, 0, 1);
const at = (day: number) => new Date(t0 + day * DAY_MS);
const point = (day: number, mbar: number): SeriesPoint => ({
	at: at(day),
	odometerKm: 10_000 + day * 100,
	deltaPMbar: mbar,
	measuredMbar: mbar
});

describe('findEpoch', () => {
	it('starts after the last cleaning, replacement or sensor repair up to now', () => {
		const points = [0, 10, 20, 30, 40].map((d) => point(d, 100));
		const events: FilterEvent[] = [
			{ at: at(5), kind: 'filter_cleaning' },
			{ at: at(25), kind: 'sensor_repair' },
			{ at: at(45), kind: 'filter_replacement' }
		];
		const epoch = findEpoch(points, events, at(41));
		expect(epoch.startedBy).toBe('sensor_repair');
		expect(epoch.points.map((p) => p.at.getTime())).toEqual([at(30).getTime(), at(40).getTime()]);
	});
});

describe('splitIntoCycles', () => {
	const saw = [
		point(0, 100),
		point(7, 120),
		point(14, 140),
		point(21, 90),
		point(28, 110),
		point(35, 130)
	];

	it('cuts at reported regenerations, counts each one, and never at interrupted ones', () => {
		const events: FilterEvent[] = [
			{ at: at(10), kind: 'regen_interrupted' },
			{ at: at(16), kind: 'regen_active' },
			{ at: at(18), kind: 'regen_active' },
			{ at: at(30), kind: 'regen_interrupted' }
		];
		const split = splitIntoCycles(
			{ startAt: null, startedBy: null, points: saw },
			events,
			at(36),
			30
		);
		expect(split.usesReports).toBe(true);
		expect(split.reportedCount).toBe(2);
		expect(split.cycles.map((c) => c.points.length)).toEqual([3, 3]);
		expect(split.cycles[1].startAt).toEqual(at(18));
		expect(split.cycles.map((c) => c.interruptedCount)).toEqual([1, 1]);
	});

	it('detects an unreported regeneration from a drop larger than the threshold', () => {
		const split = splitIntoCycles({ startAt: null, startedBy: null, points: saw }, [], at(36), 30);
		expect(split.usesReports).toBe(false);
		expect(split.detectedCount).toBe(1);
		expect(split.cycles[1].startedBy).toBe('detected');
		expect(split.cycles[1].startAt).toEqual(at(17.5));
	});

	it('ignores drops when the van reports its regenerations', () => {
		const events: FilterEvent[] = [{ at: at(2), kind: 'regen_active' }];
		const split = splitIntoCycles(
			{ startAt: null, startedBy: null, points: saw.slice(1) },
			events,
			at(36),
			30
		);
		expect(split.cycles).toHaveLength(1);
	});
});

describe('fitGrowth', () => {
	it('recovers growth and the ash baseline from regeneration-anchored cycles', () => {
		// Truth: baseline 80 + 0.1·day at each regeneration, growth 3 mbar/day, regenerations
		// every 28 days, readings every 6.5 days with a ±2 mbar pattern (+, −, −, +) that has no
		// trend and no mean within a cycle, so least squares must return the truth exactly.
		const events: FilterEvent[] = [];
		const points: SeriesPoint[] = [];
		for (let cycle = 0; cycle < 6; cycle++) {
			const s = cycle * 28 + 0.5;
			events.push({ at: at(s), kind: 'regen_active' });
			for (let k = 1; k <= 4; k++) {
				const day = s + k * 6.5;
				points.push(point(day, 80 + 0.1 * s + 3 * (day - s) + (k === 1 || k === 4 ? 2 : -2)));
			}
		}
		const now = at(170);
		const split = splitIntoCycles({ startAt: null, startedBy: null, points }, events, now, 30);
		const growth = fitGrowth(split.cycles, now, { lookbackDays: 365, outlierCutoff: 4.5 });
		expect(growth?.model).toBe('anchored');
		expect(growth?.slopeMbarPerDay).toBeCloseTo(3, 9);
		expect(growth?.baselineMbarPerDay).toBeCloseTo(0.1, 9);
		expect(growth?.residualStdDevMbar).toBeGreaterThan(0);
		expect(growth?.peaks).toHaveLength(5);
	});
});

describe('estimateKmPerDay', () => {
	it('is not moved by one mistyped odometer', () => {
		const readings = Array.from({ length: 12 }, (_, i) => ({
			at: at(i * 7),
			odometerKm: 20_000 + i * 700
		}));
		readings[5] = { ...readings[5], odometerKm: 200_000 };
		expect(estimateKmPerDay(readings, at(80), 365)).toBeCloseTo(100, 9);
	});
});
