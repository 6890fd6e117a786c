/**
 * Engine benchmark: 10,000 vans × 200 road-load readings (seeded saw-tooth histories with
 * reported regenerations) through the full crossing forecast, against a plain single-pass
 * least-squares line over the same arrays as the floor.
 * Run: npx tsx bench/engine.ts
 */
import { forecastCrossing } from '../src/lib/domain/forecast';
import type { PressureReading } from '../src/lib/domain/series';
import { createRandom } from '../src/lib/domain/stats/random';
import type { FilterEvent } from '../src/lib/domain/trend';

const VANS = 10_000;
const READINGS = 200;
const DAY_MS = 86_400_000;
const START_MS = Date.UTC(2023, 0, 2);

interface Van {
	readings: PressureReading[];
	events: FilterEvent[];
	now: Date;
	xs: Float64Array;
	ys: Float64Array;
}

/** A van read every 3 days: soot grows, regenerates at a trigger (reported), ash creeps, noise. */
function generateVan(seed: number): Van {
	const random = createRandom(seed);
	const growthMbarPerDay = 1 + random.uniform() * 5;
	const ashMbarPerDay = random.uniform() * 0.1;
	const triggerMbar = 70 + random.uniform() * 40;
	// A quarter of the vans stop completing regenerations two thirds of the way through.
	const failFromDay = random.uniform() < 0.25 ? 400 : Number.POSITIVE_INFINITY;
	const readings: PressureReading[] = [];
	const events: FilterEvent[] = [];
	const xs = new Float64Array(READINGS);
	const ys = new Float64Array(READINGS);
	let sootMbar = random.uniform() * triggerMbar;
	for (let i = 0; i < READINGS; i++) {
		const day = i * 3;
		sootMbar += growthMbarPerDay * 3;
		if (sootMbar > triggerMbar) {
			if (day < failFromDay) {
				events.push({ at: new Date(START_MS + (day - 1) * DAY_MS), kind: 'regen_active' });
				sootMbar = 3 + growthMbarPerDay;
			} else {
				events.push({ at: new Date(START_MS + (day - 1) * DAY_MS), kind: 'regen_interrupted' });
			}
		}
		const deltaPMbar = 70 + ashMbarPerDay * day + sootMbar + random.normal() * 5;
		readings.push({
			at: new Date(START_MS + day * DAY_MS),
			odometerKm: 40_000 + day * 120,
			deltaPMbar,
			condition: 'road_load'
		});
		xs[i] = day;
		ys[i] = deltaPMbar;
	}
	return { readings, events, now: new Date(START_MS + (READINGS * 3 - 2) * DAY_MS), xs, ys };
}

/** The floor: one pass of sums, then the least-squares slope and intercept. */
function plainOls(xs: Float64Array, ys: Float64Array): number {
	let sx = 0;
	let sy = 0;
	let sxx = 0;
	let sxy = 0;
	const n = xs.length;
	for (let i = 0; i < n; i++) {
		sx += xs[i];
		sy += ys[i];
		sxx += xs[i] * xs[i];
		sxy += xs[i] * ys[i];
	}
	const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx);
	return slope + (sy - slope * sx) / n;
}

const vans = Array.from({ length: VANS }, (_, i) => generateVan(i + 1));

// Warm up both paths so the JIT has compiled them before timing.
let sink = 0;
for (let i = 0; i < 200; i++) {
	sink += forecastCrossing(vans[i]).series.readingsInEpoch;
	sink += plainOls(vans[i].xs, vans[i].ys);
}

const floorRounds = 20;
let t0 = performance.now();
for (let round = 0; round < floorRounds; round++) {
	for (const van of vans) sink += plainOls(van.xs, van.ys);
}
const floorSeconds = (performance.now() - t0) / 1000 / floorRounds;

const states: Record<string, number> = {};
t0 = performance.now();
for (const van of vans) {
	const forecast = forecastCrossing(van);
	states[forecast.state] = (states[forecast.state] ?? 0) + 1;
}
const engineSeconds = (performance.now() - t0) / 1000;

const vansPerS = VANS / engineSeconds;
const floorVansPerS = VANS / floorSeconds;
const ratio = floorVansPerS / vansPerS;
console.log(`forecast states: ${JSON.stringify(states)} (checksum ${sink.toFixed(0)})`);
console.log(
	`engine: ${VANS} vans × ${READINGS} readings in ${engineSeconds.toFixed(2)} s → ${vansPerS.toFixed(0)} vans/s`
);
console.log(
	`floor (plain single-pass OLS): ${floorVansPerS.toFixed(0)} vans/s; engine is ${ratio.toFixed(1)}× slower (aim ≤ 10×)`
);
console.log(
	JSON.stringify({
		bench: 'engine',
		vans: VANS,
		readings_per_van: READINGS,
		vans_per_s: Math.round(vansPerS),
		floor_vans_per_s: Math.round(floorVansPerS),
		ratio: Number(ratio.toFixed(1))
	})
);
