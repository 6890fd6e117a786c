import { Op } from 'sequelize';
import { forecastCrossing, type CrossingForecast } from '../../domain/forecast';
import type { PressureReading } from '../../domain/series';
import type { FilterEvent } from '../../domain/trend';
import { STATUS_RANK, statusFromForecast, type VanStatus } from '../../domain/status';
import { config } from '../config';
import { Forecast, Reading, Vehicle, VehicleEvent, VehicleStatus, getDb, together } from '../db';

/** What changed for a van between its previous forecast and this one (null: nothing worth telling). */
export type StatusChange = 'crossed_line' | 'entered_window' | 'recovered' | null;

const WORRYING: VanStatus[] = ['over_line', 'crossing_soon'];

export function statusChange(previous: VanStatus | null, next: VanStatus): StatusChange {
	if (next === 'over_line' && previous !== 'over_line') return 'crossed_line';
	if (next === 'crossing_soon' && !WORRYING.includes(previous as VanStatus))
		return 'entered_window';
	if (previous && WORRYING.includes(previous) && (next === 'healthy' || next === 'watch'))
		return 'recovered';
	return null;
}

type EngineInput = { readings: PressureReading[]; events: FilterEvent[] };

/** The engine's view of some vans' rows: readings in mbar and events, in time order, per van. */
export async function loadEngineInputs(vehicleIds: number[]): Promise<Map<number, EngineInput>> {
	const inputs = new Map<number, EngineInput>(
		vehicleIds.map((id) => [id, { readings: [], events: [] }])
	);
	if (!vehicleIds.length) return inputs;
	// One query per table for the whole batch: a query per van would cost more than the maths.
	const [readings, events] = await together(
		() =>
			Reading.findAll({
				attributes: [
					'id',
					'vehicleId',
					'takenAt',
					'odometerKm',
					'deltaPMbar',
					'condition',
					'rpm',
					'airMassFlowKgH',
					'exhaustTempC',
					'ambientPressureKpa'
				],
				where: { vehicleId: { [Op.in]: vehicleIds } },
				order: [
					['vehicleId', 'ASC'],
					['takenAt', 'ASC']
				],
				raw: true
			}),
		() =>
			VehicleEvent.findAll({
				attributes: ['vehicleId', 'occurredAt', 'kind', 'odometerKm'],
				where: { vehicleId: { [Op.in]: vehicleIds } },
				order: [
					['vehicleId', 'ASC'],
					['occurredAt', 'ASC']
				],
				raw: true
			})
	);
	for (const r of readings) {
		const at = new Date(r.takenAt);
		// Rows written around the app (a manual SQL fix, a broken import elsewhere) must not
		// silently bend a forecast: the van is reported as failed with the reason instead.
		if (Number.isNaN(at.getTime()))
			throw new VanDataError(
				r.vehicleId,
				`reading #${r.id} has an unreadable time "${String(r.takenAt)}"`
			);
		if (!Number.isFinite(r.deltaPMbar))
			throw new VanDataError(r.vehicleId, `reading #${r.id} has no usable pressure`);
		inputs.get(r.vehicleId)!.readings.push({
			at,
			// A reading without an odometer still counts in time; km-based rates skip it.
			odometerKm: r.odometerKm ?? Number.NaN,
			deltaPMbar: r.deltaPMbar,
			condition: r.condition,
			rpm: r.rpm ?? undefined,
			airMassFlowKgH: r.airMassFlowKgH ?? undefined,
			exhaustTempC: r.exhaustTempC ?? undefined,
			ambientPressureKpa: r.ambientPressureKpa ?? undefined
		});
	}
	for (const e of events) {
		inputs.get(e.vehicleId)!.events.push({
			at: new Date(e.occurredAt),
			kind: e.kind,
			odometerKm: e.odometerKm ?? undefined
		});
	}
	return inputs;
}

/** Bad stored data for one van: that van fails, the run goes on. */
export class VanDataError extends Error {
	constructor(
		readonly vehicleId: number,
		message: string
	) {
		super(message);
		this.name = 'VanDataError';
	}
}

export async function loadEngineInput(vehicleId: number): Promise<EngineInput> {
	return (await loadEngineInputs([vehicleId])).get(vehicleId)!;
}

export interface StoredForecast {
	vehicleId: number;
	status: VanStatus;
	previousStatus: VanStatus | null;
	change: StatusChange;
	forecast: CrossingForecast;
}

/** Each van's current status, in one query. */
async function latestStatuses(vehicleIds: number[]): Promise<Map<number, VanStatus>> {
	if (!vehicleIds.length) return new Map();
	const rows = await VehicleStatus.findAll({
		attributes: ['vehicleId', 'status'],
		where: { vehicleId: { [Op.in]: vehicleIds } },
		raw: true
	});
	return new Map(rows.map((r) => [r.vehicleId, r.status as VanStatus]));
}

function forecastRow(
	vehicleId: number,
	forecast: CrossingForecast,
	status: VanStatus,
	previousStatus: VanStatus | null,
	change: StatusChange,
	now: Date,
	jobRunId: number | null
) {
	return {
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
	};
}

/** Board sort key: most urgent status first, then the soonest expected crossing. */
export function urgencyKey(status: VanStatus, crossingExpected: Date | null, now: Date): number {
	const days =
		crossingExpected === null
			? 99_999
			: Math.min(
					99_999,
					Math.max(0, Math.floor((crossingExpected.getTime() - now.getTime()) / 86_400_000))
				);
	return STATUS_RANK[status] * 100_000 + days;
}

function currentStatusRow(row: ReturnType<typeof forecastRow>) {
	return {
		vehicleId: row.vehicleId,
		status: row.status,
		urgency: urgencyKey(row.status, row.crossingExpected, row.computedAt),
		noCrossing: row.crossingExpected ? 0 : 1,
		confidence: row.confidence,
		latestMbar: row.latestMbar,
		concernLineMbar: row.concernLineMbar,
		growthMbarPerWeek: row.growthMbarPerWeek,
		crossingEarliest: row.crossingEarliest,
		crossingExpected: row.crossingExpected,
		crossingLatest: row.crossingLatest,
		computedAt: row.computedAt
	};
}

interface BatchResult {
	stored: StoredForecast[];
	failures: { vehicleId: number; error: string }[];
}

/**
 * Forecasts a batch of vans and stores one new history row each, in one transaction. A van
 * whose data breaks the engine is reported and skipped; the others are still stored.
 */
export async function forecastVehicles(
	vehicleIds: number[],
	now: Date,
	jobRunId: number | null = null
): Promise<BatchResult> {
	const result: BatchResult = { stored: [], failures: [] };
	let inputs: Map<number, EngineInput>;
	let pending = [...vehicleIds];
	for (;;) {
		try {
			inputs = await loadEngineInputs(pending);
			break;
		} catch (err) {
			if (!(err instanceof VanDataError)) throw err;
			result.failures.push({ vehicleId: err.vehicleId, error: err.message });
			pending = pending.filter((id) => id !== err.vehicleId);
		}
	}
	const previous = await latestStatuses(pending);
	const rows: ReturnType<typeof forecastRow>[] = [];
	for (const vehicleId of pending) {
		try {
			const { readings, events } = inputs.get(vehicleId)!;
			const forecast = forecastCrossing({ readings, events, now });
			const { status } = statusFromForecast(forecast, now, {
				soonDays: config.FORECAST_SOON_DAYS,
				watchDays: config.FORECAST_WATCH_DAYS
			});
			const previousStatus = previous.get(vehicleId) ?? null;
			const change = statusChange(previousStatus, status);
			rows.push(forecastRow(vehicleId, forecast, status, previousStatus, change, now, jobRunId));
			result.stored.push({ vehicleId, status, previousStatus, change, forecast });
		} catch (err) {
			result.failures.push({ vehicleId, error: err instanceof Error ? err.message : String(err) });
		}
	}
	await getDb().transaction(async () => {
		await Forecast.bulkCreate(rows);
		await VehicleStatus.bulkCreate(rows.map(currentStatusRow), {
			updateOnDuplicate: [
				'status',
				'urgency',
				'noCrossing',
				'confidence',
				'latestMbar',
				'concernLineMbar',
				'growthMbarPerWeek',
				'crossingEarliest',
				'crossingExpected',
				'crossingLatest',
				'computedAt'
			]
		});
	});
	return result;
}

/** Forecasts one van now and stores the result as the newest row of its history. */
export async function forecastVehicle(
	vehicleId: number,
	now: Date,
	jobRunId: number | null = null
): Promise<StoredForecast> {
	const { stored, failures } = await forecastVehicles([vehicleId], now, jobRunId);
	if (failures.length) throw new Error(failures[0].error);
	return stored[0];
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
export async function forecastAllVehicles(
	now: Date,
	jobRunId: number | null = null,
	batchSize = 500
): Promise<ForecastRunResult> {
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
		result.vans += batch.length;
		const { stored, failures } = await forecastVehicles(
			batch.map((v) => v.id),
			now,
			jobRunId
		);
		result.forecast += stored.length;
		result.changes.push(...stored.filter((s) => s.change));
		for (const failure of failures) {
			const registration =
				batch.find((v) => v.id === failure.vehicleId)?.registration ?? `#${failure.vehicleId}`;
			console.error(
				`[forecast] van ${registration} (#${failure.vehicleId}) failed: ${failure.error}`
			);
			result.failures.push({ ...failure, registration });
		}
		afterId = batch[batch.length - 1].id;
	}
	return result;
}
