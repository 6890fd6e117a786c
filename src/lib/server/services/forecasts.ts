import { Op } from 'sequelize';
import { forecastCrossing, type CrossingForecast } from '../../domain/forecast';
import type { PressureReading } from '../../domain/series';
import type { FilterEvent } from '../../domain/trend';
import { statusFromForecast, type VanStatus } from '../../domain/status';
import { config } from '../config';
import { Forecast, Reading, Vehicle, VehicleEvent } from '../db';

/** What changed for a van between its previous forecast and this one (null: nothing worth telling). */
export type StatusChange = 'crossed_line' | 'entered_window' | 'recovered' | null;

const WORRYING: VanStatus[] = ['over_line', 'crossing_soon'];

export function statusChange(previous: VanStatus | null, next: VanStatus): StatusChange {
	if (next === 'over_line' && previous !== 'over_line') return 'crossed_line';
	if (next === 'crossing_soon' && !WORRYING.includes(previous as VanStatus)) return 'entered_window';
	if (previous && WORRYING.includes(previous) && (next === 'healthy' || next === 'watch')) return 'recovered';
	return null;
}

/** The engine's view of a van's rows: readings in mbar, events, both in time order. */
export async function loadEngineInput(vehicleId: number): Promise<{ readings: PressureReading[]; events: FilterEvent[] }> {
	const [readings, events] = await Promise.all([
		Reading.findAll({ where: { vehicleId }, order: [['takenAt', 'ASC']], raw: true }),
		VehicleEvent.findAll({ where: { vehicleId }, order: [['occurredAt', 'ASC']], raw: true })
	]);
	for (const r of readings) {
		// Rows written around the app (a manual SQL fix, a broken import elsewhere) must not
		// silently bend a forecast: the van is reported as failed with the reason instead.
		if (Number.isNaN(new Date(r.takenAt).getTime())) throw new Error(`reading #${r.id} has an unreadable time "${String(r.takenAt)}"`);
		if (!Number.isFinite(r.deltaPMbar)) throw new Error(`reading #${r.id} has no usable pressure`);
	}
	return {
		readings: readings.map((r) => ({
			at: new Date(r.takenAt),
			// A reading without an odometer still counts in time; km-based rates skip it.
			odometerKm: r.odometerKm ?? Number.NaN,
			deltaPMbar: r.deltaPMbar,
			condition: r.condition,
			rpm: r.rpm ?? undefined,
			airMassFlowKgH: r.airMassFlowKgH ?? undefined,
			exhaustTempC: r.exhaustTempC ?? undefined,
			ambientPressureKpa: r.ambientPressureKpa ?? undefined
		})),
		events: events.map((e) => ({ at: new Date(e.occurredAt), kind: e.kind, odometerKm: e.odometerKm ?? undefined }))
	};
}

export interface StoredForecast {
	vehicleId: number;
	status: VanStatus;
	previousStatus: VanStatus | null;
	change: StatusChange;
	forecast: CrossingForecast;
}

/** Forecasts one van now and stores the result as the newest row of its history. */
export async function forecastVehicle(vehicleId: number, now: Date, jobRunId: number | null = null): Promise<StoredForecast> {
	const { readings, events } = await loadEngineInput(vehicleId);
	const forecast = forecastCrossing({ readings, events, now });
	const { status } = statusFromForecast(forecast, now, {
		soonDays: config.FORECAST_SOON_DAYS,
		watchDays: config.FORECAST_WATCH_DAYS
	});
	const previous = await Forecast.findOne({ where: { vehicleId }, order: [['id', 'DESC']], attributes: ['status'] });
	const previousStatus = (previous?.status as VanStatus | undefined) ?? null;
	const change = statusChange(previousStatus, status);
	await Forecast.create({
		vehicleId,
		computedAt: now,
		jobRunId,
		series: forecast.series.kind,
		status,
		confidence: forecast.confidence.grade,
		latestMbar: forecast.series.lastReadingMbar,
		concernLineMbar: forecast.series.concernMbar,
		growthMbarPerWeek: forecast.growth?.mbarPerWeek ?? null,
		growthMbarPer1000Km: forecast.growth?.mbarPer1000Km ?? null,
		baselineMbarPer1000Km: forecast.baseline?.mbarPer1000Km ?? null,
		kmPerDay: forecast.kmPerDay,
		crossingEarliest: forecast.crossing.earliest,
		crossingExpected: forecast.crossing.expected,
		crossingLatest: forecast.crossing.latest,
		explanation: forecast.explanation,
		details: {
			state: forecast.state,
			mode: forecast.mode,
			change,
			previousStatus,
			confidenceReason: forecast.confidence.reason,
			seriesLabel: forecast.series.label,
			seriesRule: forecast.series.rule,
			readingsInEpoch: forecast.series.readingsInEpoch,
			epochStartAt: forecast.series.epochStartAt?.toISOString() ?? null,
			lastReadingAt: forecast.series.lastReadingAt?.toISOString() ?? null,
			currentLevelMbar: forecast.currentLevelMbar,
			typicalPeakMbar: forecast.typicalPeakMbar,
			regenerations: forecast.regenerations,
			intervalLevel: forecast.crossing.level,
			beyondHorizon: forecast.crossing.beyondHorizon,
			growth: forecast.growth,
			baseline: forecast.baseline
		}
	});
	return { vehicleId, status, previousStatus, change, forecast };
}

export interface ForecastRunResult {
	vans: number;
	forecast: number;
	failures: { vehicleId: number; registration: string; error: string }[];
	changes: StoredForecast[];
}

/**
 * Forecasts every active van. A van whose data breaks the engine is reported as failed and
 * the run carries on with the others.
 */
export async function forecastAllVehicles(now: Date, jobRunId: number | null = null, batchSize = 500): Promise<ForecastRunResult> {
	const result: ForecastRunResult = { vans: 0, forecast: 0, failures: [], changes: [] };
	let afterId = 0;
	for (;;) {
		const batch = await Vehicle.findAll({
			where: { archivedAt: null, id: { [Op.gt]: afterId } },
			attributes: ['id', 'registration'],
			order: [['id', 'ASC']],
			limit: batchSize,
			raw: true
		});
		if (!batch.length) break;
		for (const van of batch) {
			result.vans++;
			try {
				const stored = await forecastVehicle(van.id, now, jobRunId);
				result.forecast++;
				if (stored.change) result.changes.push(stored);
			} catch (err) {
				const message = err instanceof Error ? err.message : String(err);
				console.error(`[forecast] van ${van.registration} (#${van.id}) failed: ${message}`);
				result.failures.push({ vehicleId: van.id, registration: van.registration, error: message });
			}
		}
		afterId = batch[batch.length - 1].id;
	}
	return result;
}
