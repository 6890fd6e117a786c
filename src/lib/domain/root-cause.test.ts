import { describe, expect, it } from 'vitest';
import { forecastCrossing } from './forecast';
import { findRootCauseHints } from './root-cause';
import { MIXED_PROFILE, simulateVanHistory, type SimulateVanOptions } from './simulate';
import { summariseUsage } from './usage';

const start = new Date('2024-01-01T00:00:00Z');
const now = new Date(start.getTime() + 364.9 * 86_400_000);
function hintsFor(options: Partial<SimulateVanOptions>, profile = {}) {
	const h = simulateVanHistory({ seed: 21, start, days: 365, profile: MIXED_PROFILE, ...options });
	const forecast = forecastCrossing({ readings: h.readings, events: h.events, now });
	return findRootCauseHints(forecast, summariseUsage(h.trips, now), profile).map((x) => x.cause);
}

describe('findRootCauseHints on simulated vans', () => {
	it('finds nothing on a healthy van', () => {
		expect(hintsFor({})).toEqual([]);
	});

	it('points at the sensor pipe when readings go flat near zero', () => {
		expect(hintsFor({ sensorLeakFromDay: 300 })).toEqual(['sensor_pipe_leak']);
	});

	it('points at engine soot when soot grows fast on a normal duty cycle', () => {
		expect(
			hintsFor({ sootMultiplier: 3, profile: { ...MIXED_PROFILE, shortTripShare: 0.2 } })
		).toContain('engine_soot');
	});

	it('points at ash when the post-regeneration baseline climbs', () => {
		expect(hintsFor({ ashMbarPer1000Km: 3 })).toContain('ash_loading');
	});

	it('points at the duty cycle when regenerations are cut short on short trips', () => {
		const causes = hintsFor({
			regenFailsFromDay: 330,
			profile: { ...MIXED_PROFILE, shortTripShare: 0.8 }
		});
		expect(causes).toContain('interrupted_regenerations');
		expect(causes).toContain('short_trips');
	});

	it('flags an oil that is not a low-ash grade where the maker requires one', () => {
		expect(hintsFor({}, { makerRequiresLowAshOil: true, oilSpec: 'ACEA A3/B4' })).toEqual([
			'oil_spec'
		]);
		expect(hintsFor({}, { makerRequiresLowAshOil: true, oilSpec: 'ACEA C3' })).toEqual([]);
	});
});
