import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	airDensityKgM3,
	buildSeries,
	chooseComparableSeries,
	DEFAULT_REFERENCE_FLOW_M3S,
	scaleToReferenceFlow,
	sortedByTime,
	volumetricFlowM3s,
	type PressureReading
} from './series';

describe('airDensityKgM3', () => {
	it.each([
		// Source: reference/gas.md — "Density of air" table (Wikipedia, via liquisearch mirror;
		// engineersedge for 0 °C), dry air at 101.325 kPa, 4 decimals. That table states
		// R = 287.058 J/(kg·K), so the formula is checked with the table's own constant.
		[0, 1.2922],
		[15, 1.225],
		[20, 1.2041],
		[25, 1.1839]
	])('gives the handbook density at %i °C within 5e-5 kg/m³', (temperatureC, density) => {
		expect(Math.abs(airDensityKgM3(temperatureC, 101.325, 287.058) - density)).toBeLessThanOrEqual(
			5e-5
		);
	});

	it('gives the ISA sea-level density with the default constant (WMO R = 287.05)', () => {
		// Source: reference/gas.md — ICAO Standard Atmosphere / USSA 1976, ρ₀ = 1.225 kg/m³ at
		// 15 °C and 101 325 Pa; and its derived R = 287.05 column: 1.292 284 at 0 °C, 1.204 118 at 20 °C.
		expect(Math.abs(airDensityKgM3(15) - 1.225)).toBeLessThanOrEqual(5e-5);
		expect(airDensityKgM3(0)).toBeCloseTo(1.292284, 6);
		expect(airDensityKgM3(20)).toBeCloseTo(1.204118, 6);
	});
});

describe('volumetricFlowM3s', () => {
	it.each([
		// Source: reference/gas.md "Ideal-gas volumetric flow check" (derived there with R = 287.05):
		// 199.8 kg/h at 101 325 Pa.
		[0, 0.042947],
		[15, 0.045306],
		[300, 0.090116]
	])('turns 199.8 kg/h at %i °C into the check value in m³/s', (temperatureC, flow) => {
		expect(volumetricFlowM3s(199.8, temperatureC)).toBeCloseTo(flow, 6);
	});

	it('uses standard pressure when none is given and scales inversely with pressure', () => {
		expect(volumetricFlowM3s(199.8, 15, 101.325)).toBe(volumetricFlowM3s(199.8, 15));
		expect(volumetricFlowM3s(199.8, 15, 50.6625)).toBeCloseTo(2 * volumetricFlowM3s(199.8, 15), 12);
	});
});

describe('scaleToReferenceFlow', () => {
	it('scales Δp in proportion to flow (Darcy)', () => {
		expect(scaleToReferenceFlow(100, 0.05, 0.1)).toBe(200);
		expect(scaleToReferenceFlow(100, 0.1, 0.1)).toBe(100);
	});
});

const at = (day: number) => new Date(Date.UTC(2024, 0, 1 + day));
function reading(
	day: number,
	condition: PressureReading['condition'],
	extra: Partial<PressureReading> = {}
): PressureReading {
	return { at: at(day), odometerKm: 1000 + day * 50, deltaPMbar: 100 + day, condition, ...extra };
}

describe('comparable series', () => {
	it('scales telemetry with flow data to the reference flow and skips what cannot be scaled', () => {
		const readings = [
			reading(0, 'telemetry', { airMassFlowKgH: 300, exhaustTempC: 350, deltaPMbar: 150 }),
			reading(1, 'telemetry', { airMassFlowKgH: 150, exhaustTempC: 350, deltaPMbar: 75 }),
			reading(2, 'telemetry', { deltaPMbar: 80 }),
			reading(3, 'telemetry', { airMassFlowKgH: 20, exhaustTempC: 200, deltaPMbar: 5 })
		];
		const series = buildSeries(readings, 'flow_normalised');
		expect(series.points.map((p) => p.deltaPMbar)).toEqual([
			expect.closeTo(150, 9),
			expect.closeTo(150, 9)
		]);
		expect(series.skipped).toEqual([
			{ reason: 'flow outside the window where scaling holds', count: 1 },
			{ reason: 'telemetry without mass flow or exhaust temperature', count: 1 }
		]);
		expect(DEFAULT_REFERENCE_FLOW_M3S).toBeCloseTo(volumetricFlowM3s(300, 350), 12);
	});

	it('keeps raised-idle readings at one engine speed together', () => {
		const readings = [
			reading(0, 'raised_idle', { rpm: 2000 }),
			reading(1, 'raised_idle', { rpm: 2050 }),
			reading(2, 'raised_idle', { rpm: 1500 }),
			reading(3, 'raised_idle')
		];
		const series = buildSeries(readings, 'raised_idle');
		expect(series.rpm).toBe(2000);
		expect(series.points).toHaveLength(2);
		expect(series.limit.concernMbar).toBe(200);
	});

	it('prefers flow-normalised, then road load, then raised idle, then idle', () => {
		const road = Array.from({ length: 8 }, (_, i) => reading(i * 7, 'road_load'));
		const idle = Array.from({ length: 12 }, (_, i) => reading(i * 3, 'idle'));
		const telemetry = Array.from({ length: 5 }, (_, i) =>
			reading(i, 'telemetry', { airMassFlowKgH: 300, exhaustTempC: 350 })
		);
		const chosen = chooseComparableSeries([...road, ...idle, ...telemetry]);
		expect(chosen.kind).toBe('road_load');
		expect(chosen.limit.concernMbar).toBe(300);
		expect(chosen.rule).toMatch(/5 Δp scaled/);
		expect(chooseComparableSeries(idle).kind).toBe('idle');
		expect(chooseComparableSeries(idle).limit.concernMbar).toBe(120);
	});
});

describe('sortedByTime', () => {
	const items = fc.array(
		fc.record({
			// Few distinct times, so ties (which a stable sort keeps in order) are common.
			day: fc.integer({ min: 0, max: 12 }),
			id: fc.integer()
		}),
		{ maxLength: 40 }
	);
	const withDates = (list: { day: number; id: number }[]) =>
		list.map((r) => ({ at: new Date(Date.UTC(2024, 0, 1 + r.day)), id: r.id }));

	it('gives the same order as a plain stable sort', () => {
		fc.assert(
			fc.property(items, (list) => {
				const expected = withDates(list).sort((a, b) => a.at.getTime() - b.at.getTime());
				expect(sortedByTime(withDates(list))).toEqual(expected);
			})
		);
	});

	it('returns an already sorted list itself, untouched', () => {
		fc.assert(
			fc.property(items, (list) => {
				const sorted = withDates([...list].sort((a, b) => a.day - b.day));
				const before = [...sorted];
				expect(sortedByTime(sorted)).toBe(sorted);
				expect(sorted).toEqual(before);
			})
		);
	});
});
