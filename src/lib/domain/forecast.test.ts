import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { forecastCrossing, type CrossingForecast } from './forecast';
import type { PressureReading } from './series';
import { MIXED_PROFILE, simulateVanHistory, type DutyCycleProfile } from './simulate';
import { createRandom } from './stats/random';
import type { FilterEvent } from './trend';

const DAY_MS = 86_400_000;
const start = new Date('2023-01-02T00:00:00Z');
const dayOf = (at: Date) => (at.getTime() - start.getTime()) / DAY_MS;

/** A rising road-load series: one reading a week, level = firstMbar + growth·days + noise. */
function risingSeries(
	count: number,
	firstMbar: number,
	growthMbarPerDay: number,
	noise: (i: number) => number = () => 0
): PressureReading[] {
	return Array.from({ length: count }, (_, i) => ({
		at: new Date(start.getTime() + i * 7 * DAY_MS),
		odometerKm: 50_000 + i * 500,
		deltaPMbar: firstMbar + growthMbarPerDay * i * 7 + noise(i),
		condition: 'road_load' as const
	}));
}

const dayAfter = (readings: PressureReading[]) =>
	new Date(readings[readings.length - 1].at.getTime() + DAY_MS);

describe('forecastCrossing on simple series', () => {
	it('projects a clean linear rise to the line', () => {
		const readings = risingSeries(10, 150, 2);
		const f = forecastCrossing({ readings, events: [], now: dayAfter(readings) });
		expect(f.state).toBe('crossing');
		expect(f.mode).toBe('single_cycle');
		// 150 + 2·t = 300 → t = 75 days after the first reading.
		expect(dayOf(f.crossing.expected as Date)).toBeCloseTo(75, 6);
		expect(f.growth?.mbarPerWeek).toBeCloseTo(14, 9);
		expect(f.explanation).toContain('300 mbar');
	});

	it('says not enough data below the reading count, with the rule', () => {
		const readings = risingSeries(5, 150, 2);
		const f = forecastCrossing({ readings, events: [], now: dayAfter(readings) });
		expect(f.state).toBe('insufficient_data');
		expect(f.explanation).toMatch(/at least 6/);
		expect(f.crossing.expected).toBeNull();
	});

	it('says not enough data when the readings span too few days', () => {
		const readings = risingSeries(8, 150, 2).map((r, i) => ({
			...r,
			at: new Date(start.getTime() + i * 2 * DAY_MS)
		}));
		const f = forecastCrossing({ readings, events: [], now: dayAfter(readings) });
		expect(f.state).toBe('insufficient_data');
		expect(f.explanation).toMatch(/span 14 days; a forecast needs at least 21/);
	});

	it('says not enough data when the last reading is stale', () => {
		const readings = risingSeries(10, 150, 2);
		const now = new Date(readings[9].at.getTime() + 120 * DAY_MS);
		expect(forecastCrossing({ readings, events: [], now }).state).toBe('insufficient_data');
	});

	it('reports over the line when the latest readings are above it', () => {
		const readings = risingSeries(10, 240, 1.5);
		const f = forecastCrossing({ readings, events: [], now: dayAfter(readings) });
		expect(f.state).toBe('over_line');
		expect(f.confidence.grade).toBe('firm');
	});

	it('does not call one wild high reading over the line', () => {
		const readings = risingSeries(10, 150, 1, (i) => (i === 9 ? 200 : (i % 3) - 1));
		const f = forecastCrossing({ readings, events: [], now: dayAfter(readings) });
		expect(f.state).toBe('crossing');
		expect(f.growth?.screenedOut).toBe(1);
	});

	it('says no crossing within the horizon for a flat series', () => {
		const readings = risingSeries(12, 150, 0, (i) => ((i * 7) % 5) - 2);
		const f = forecastCrossing({ readings, events: [], now: dayAfter(readings) });
		expect(f.state).toBe('no_crossing');
		expect(f.crossing.expected).toBeNull();
	});

	it('flags a flat near-zero series under load as implausible', () => {
		const readings = risingSeries(10, 8, 0, (i) => i % 3);
		const f = forecastCrossing({ readings, events: [], now: dayAfter(readings) });
		expect(f.state).toBe('implausible_readings');
		expect(f.explanation).toMatch(/sensor and its pipes/);
	});

	it('starts a new baseline after a filter cleaning', () => {
		const before = risingSeries(10, 250, 1);
		const cleanedAt = new Date(before[9].at.getTime() + DAY_MS);
		const after = risingSeries(3, 90, 1).map((r, i) => ({
			...r,
			at: new Date(cleanedAt.getTime() + (i + 1) * 7 * DAY_MS)
		}));
		const events: FilterEvent[] = [{ at: cleanedAt, kind: 'filter_cleaning' }];
		const f = forecastCrossing({ readings: [...before, ...after], events, now: dayAfter(after) });
		expect(f.series.readingsInEpoch).toBe(3);
		expect(f.state).toBe('insufficient_data');
		expect(f.explanation).toMatch(/since the filter cleaning/);
	});

	it('uses the concern line of the chosen series and honours an override', () => {
		const readings = risingSeries(10, 150, 2);
		const f = forecastCrossing({
			readings,
			events: [],
			now: dayAfter(readings),
			options: { concernMbar: 290 }
		});
		// 150 + 2·t = 290 → t = 70 days.
		expect(dayOf(f.crossing.expected as Date)).toBeCloseTo(70, 6);
		expect(f.series.concernMbar).toBe(290);
	});

	it('never gives a later crossing for faster growth', () => {
		// Property of the model: adding growth raises every later reading and the slope alike.
		const when = (f: CrossingForecast) =>
			f.state === 'over_line'
				? Number.NEGATIVE_INFINITY
				: f.state === 'crossing'
					? (f.crossing.expected as Date).getTime()
					: Number.POSITIVE_INFINITY;
		fc.assert(
			fc.property(
				fc.double({ min: 0.2, max: 5, noNaN: true }),
				fc.double({ min: 0, max: 3, noNaN: true }),
				fc.double({ min: 80, max: 250, noNaN: true }),
				fc.array(fc.double({ min: -8, max: 8, noNaN: true }), { minLength: 12, maxLength: 12 }),
				(growth, extra, firstMbar, noise) => {
					const slow = risingSeries(12, firstMbar, growth, (i) => noise[i]);
					const fast = risingSeries(12, firstMbar, growth + extra, (i) => noise[i]);
					const now = dayAfter(slow);
					const a = forecastCrossing({ readings: slow, events: [], now });
					const b = forecastCrossing({ readings: fast, events: [], now });
					expect(when(b)).toBeLessThanOrEqual(when(a));
				}
			)
		);
	});
});

interface TruthCase {
	readings: PressureReading[];
	events: FilterEvent[];
	now: Date;
	crossingDay: number;
	noiseMbar: number;
	dailyLevelMbar: number[];
}

/**
 * Known-truth vans: soot grows linearly in time (plus ash per km), regenerations complete
 * until, on a random day, they start failing (every attempt interrupted); readings weekly with
 * Gaussian noise no larger than the weekly growth. The forecast is made at a random moment
 * from a week after the first interrupted regeneration to six weeks before the true crossing.
 */
function knownTruthVans(count: number, withEvents: boolean): TruthCase[] {
	const cases: TruthCase[] = [];
	for (let seed = 1; cases.length < count; seed++) {
		const r = createRandom(seed * 7919);
		const u = (a: number, b: number) => a + (b - a) * r.uniform();
		const profile: DutyCycleProfile = {
			tripsPerWorkingDay: u(2, 6),
			shortTripShare: u(0.2, 0.6),
			shortTripKm: u(4, 8),
			shortTripMinutes: u(10, 16),
			longTripKm: u(25, 60),
			longTripMinutes: u(28, 55),
			idleShare: u(0.05, 0.2),
			workingDaysPerWeek: 5
		};
		const sootMbarPerDay = u(0.8, 3);
		const failDay = Math.round(u(180, 420));
		const ashMbarPer1000Km = u(0.2, 1);
		const noiseShare = u(0.15, 1);
		const options = {
			seed,
			start,
			days: failDay + 400,
			profile,
			sootMbarPerDay,
			ashMbarPer1000Km,
			regenFailsFromDay: failDay,
			// Additive Gaussian noise only, the error model the forecast's interval assumes.
			roadLoadFlowSpread: 0
		};
		// Reading noise does not change the simulated truth, so size it from the expected growth.
		const noiseMbar =
			noiseShare * 7 * simulateVanHistory({ ...options, days: 1 }).truth.levelGrowthMbarPerDay;
		const h = simulateVanHistory({ ...options, noiseMbar });
		const crossingDay = h.truth.crossingDay;
		if (crossingDay === null) continue;
		const lastRegen = h.events
			.filter((e) => e.kind === 'regen_active' && dayOf(e.at) < crossingDay)
			.pop();
		const firstTrouble = h.events.find(
			(e) =>
				e.kind === 'regen_interrupted' &&
				(!lastRegen || e.at > lastRegen.at) &&
				dayOf(e.at) < crossingDay
		);
		if (!firstTrouble) continue;
		const from = Math.ceil(dayOf(firstTrouble.at) + 7);
		const to = Math.floor(crossingDay - 42);
		if (to < from) continue;
		const cutDay = from + Math.floor(r.uniform() * (to - from + 1));
		const now = new Date(start.getTime() + cutDay * DAY_MS + 20 * 3_600_000);
		const readings = h.readings.filter((x) => x.at <= now);
		expect(readings.length).toBeGreaterThanOrEqual(12);
		cases.push({
			readings,
			events: withEvents ? h.events.filter((x) => x.at <= now) : [],
			now,
			crossingDay,
			noiseMbar,
			dailyLevelMbar: h.truth.dailyRoadLoadMbar
		});
	}
	return cases;
}

describe('forecastCrossing on known-truth simulations', () => {
	it('puts the expected crossing within 15 % of the true time for 90 % of vans, and the interval covers it at its level', () => {
		// Known truth from simulate.ts (seeded). Criteria: expected crossing within 15 % of the true
		// time to crossing, counted from the last reading, for ≥ 90 % of vans; the 80 % interval
		// covers the true crossing 80 % ± 5 points of the time.
		const cases = knownTruthVans(200, true);
		let hits = 0;
		let covered = 0;
		let widthDays = 0;
		let readingCovered = 0;
		const noise = createRandom(2024);
		for (const c of cases) {
			const f = forecastCrossing({ readings: c.readings, events: c.events, now: c.now });
			expect(f.state).toBe('crossing');
			expect(f.mode).toBe('not_regenerating');
			const lastDay = dayOf(f.series.lastReadingAt as Date);
			const expected = dayOf(f.crossing.expected as Date);
			if (Math.abs(expected - c.crossingDay) <= 0.15 * (c.crossingDay - lastDay)) hits++;
			const earliest = dayOf(f.crossing.earliest as Date);
			const latest = dayOf(f.crossing.latest as Date);
			if (earliest <= c.crossingDay && c.crossingDay <= latest) covered++;
			widthDays += latest - earliest;

			// The `reading` interval is for the day a single new reading would show the line:
			// truth = where level + one fresh noise draw reaches 300 (days, from daily levels).
			const r = forecastCrossing({
				readings: c.readings,
				events: c.events,
				now: c.now,
				options: { intervalKind: 'reading' }
			});
			const threshold = 300 - noise.normal() * c.noiseMbar;
			const day = c.dailyLevelMbar.findIndex(
				(v, d) => d >= Math.floor(c.crossingDay) - 60 && v >= threshold
			);
			if (day > 0) {
				const fraction =
					(threshold - c.dailyLevelMbar[day - 1]) /
					(c.dailyLevelMbar[day] - c.dailyLevelMbar[day - 1]);
				// Daily levels are recorded at the evening reading time, 17:30 (0.73 of a day).
				const readingCrossing = day - 1 + fraction + 0.73;
				if (
					dayOf(r.crossing.earliest as Date) <= readingCrossing &&
					readingCrossing <= dayOf(r.crossing.latest as Date)
				) {
					readingCovered++;
				}
			}
		}
		const hitRate = hits / cases.length;
		const coverage = covered / cases.length;
		console.log(
			`known truth, ${cases.length} vans: hit rate (within 15 %) ${(hitRate * 100).toFixed(1)} %, ` +
				`80 % interval coverage ${(coverage * 100).toFixed(1)} %, mean interval width ${(widthDays / cases.length).toFixed(1)} days; ` +
				`reading-interval coverage of a reading's crossing ${((readingCovered / cases.length) * 100).toFixed(1)} %`
		);
		expect(hitRate).toBeGreaterThanOrEqual(0.9);
		expect(Math.abs(coverage - 0.8)).toBeLessThanOrEqual(0.05);
	});

	it('prints how the same vans fare when regenerations are not reported (detection only)', () => {
		// Information, not a pass mark: without reports the forecast sees failing regenerations
		// only once the level has clearly passed this van's usual peak.
		const cases = knownTruthVans(100, false);
		let hits = 0;
		let crossing = 0;
		for (const c of cases) {
			const f = forecastCrossing({ readings: c.readings, events: c.events, now: c.now });
			if (f.state !== 'crossing') continue;
			crossing++;
			const lastDay = dayOf(f.series.lastReadingAt as Date);
			if (
				Math.abs(dayOf(f.crossing.expected as Date) - c.crossingDay) <=
				0.15 * (c.crossingDay - lastDay)
			)
				hits++;
		}
		console.log(
			`known truth without regeneration reports, ${cases.length} vans: ${crossing} forecast a crossing, ${hits} within 15 %`
		);
		expect(crossing).toBeGreaterThan(0);
	});

	it('says no crossing for vans whose regenerations keep up, and finds the ones that do cross', () => {
		// Known truth from simulate.ts: realistic per-trip soot on mixed duty cycles, 18 months
		// observed, truth followed for a further year.
		let agree = 0;
		let falseAlarms = 0;
		let missed = 0;
		for (let seed = 1; seed <= 100; seed++) {
			const r = createRandom(seed * 31);
			const profile = {
				...MIXED_PROFILE,
				tripsPerWorkingDay: 3 + 6 * r.uniform(),
				shortTripShare: 0.1 + 0.5 * r.uniform()
			};
			const h = simulateVanHistory({
				seed,
				start,
				days: 540 + 365,
				observedDays: 540,
				profile,
				ashMbarPer1000Km: 0.2 + 0.8 * r.uniform(),
				initialAshMbar: 40 * r.uniform()
			});
			const now = new Date(start.getTime() + 539.9 * DAY_MS);
			const f = forecastCrossing({ readings: h.readings, events: h.events, now });
			const truthCrosses = h.truth.crossingDay !== null && h.truth.crossingDay < 540 + 365;
			const saysCrosses = f.state === 'crossing' || f.state === 'over_line';
			if (truthCrosses === saysCrosses) agree++;
			else if (saysCrosses) falseAlarms++;
			else missed++;
		}
		console.log(
			`keeping-up fleet, 100 vans: ${agree} agree with the truth within a year, ${falseAlarms} false alarms, ${missed} missed`
		);
		expect(agree).toBeGreaterThanOrEqual(95);
	});
});
