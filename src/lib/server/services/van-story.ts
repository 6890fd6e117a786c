import { Op } from 'sequelize';
import { forecastCrossing, type CrossingForecast } from '../../domain/forecast';
import { buildSeries, SERIES_KINDS, SERIES_LABELS, type SeriesKind } from '../../domain/series';
import { statusFromForecast } from '../../domain/status';
import { summariseUsage, type UsageSummary } from '../../domain/usage';
import { findRootCauseHints } from '../../domain/root-cause';
import { adviseFleetManager } from '../../domain/advice';
import { config } from '../config';
import { Depot, Reading, SensorType, Trip, User, VehicleEvent, VisitReport } from '../db';
import type { SessionUser } from '../auth/lucia';
import { findVisibleVehicle } from './vehicles';
import { loadEngineInput } from './forecasts';

const DAY_MS = 86_400_000;
const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);

/** Plain numbers of the usage profile, for the page (no Date objects in load data). */
function usageView(u: UsageSummary) {
	return {
		trips: u.trips,
		shortTripShare: u.shortTripShare,
		regenCapablePerWeek: u.regenCapablePerWeek,
		idleShare: u.idleShare,
		meanTripKm: u.meanTripKm,
		meanTripMinutes: u.meanTripMinutes,
		kmPerDay: u.kmPerDay,
		windowDays: u.windowDays,
		thresholds: u.options,
		weeks: u.weeks.map((w) => ({
			from: w.from.toISOString(),
			trips: w.trips,
			shortTrips: w.shortTrips,
			regenCapable: w.regenCapableDrives
		}))
	};
}

function forecastView(f: CrossingForecast) {
	return {
		state: f.state,
		mode: f.mode,
		seriesKind: f.series.kind,
		seriesLabel: f.series.label,
		seriesRule: f.series.rule,
		concernMbar: f.series.concernMbar,
		readingsInEpoch: f.series.readingsInEpoch,
		epochStartAt: iso(f.series.epochStartAt),
		lastReadingAt: iso(f.series.lastReadingAt),
		lastReadingMbar: f.series.lastReadingMbar,
		growth: f.growth && {
			mbarPerWeek: f.growth.mbarPerWeek,
			mbarPer1000Km: f.growth.mbarPer1000Km,
			theilSenMbarPerWeek: f.growth.theilSenMbarPerDay * 7,
			readingsUsed: f.growth.readingsUsed,
			cyclesUsed: f.growth.cyclesUsed
		},
		baseline: f.baseline,
		kmPerDay: f.kmPerDay,
		currentLevelMbar: f.currentLevelMbar,
		typicalPeakMbar: f.typicalPeakMbar,
		regenerations: f.regenerations,
		crossing: {
			earliest: iso(f.crossing.earliest),
			expected: iso(f.crossing.expected),
			latest: iso(f.crossing.latest),
			level: f.crossing.level,
			beyondHorizon: f.crossing.beyondHorizon
		},
		confidence: f.confidence,
		explanation: f.explanation
	};
}

/**
 * Everything a van's page shows, computed now from its stored rows: the chosen comparable
 * series for the chart, the live forecast and status, usage, root-cause hints and advice.
 */
export async function getVanStory(
	user: SessionUser,
	vehicleId: number,
	options: { series?: SeriesKind; now?: Date } = {}
) {
	const now = options.now ?? new Date();
	const vehicle = await findVisibleVehicle(user, vehicleId);
	const [input, depot, driver, sensorType, recentReadings, events, trips, visits] =
		await Promise.all([
			loadEngineInput(vehicleId),
			vehicle.depotId ? Depot.findByPk(vehicle.depotId, { raw: true }) : null,
			vehicle.driverId
				? User.findByPk(vehicle.driverId, { attributes: ['id', 'name'], raw: true })
				: null,
			vehicle.sensorTypeId ? SensorType.findByPk(vehicle.sensorTypeId, { raw: true }) : null,
			Reading.findAll({ where: { vehicleId }, order: [['takenAt', 'DESC']], limit: 50, raw: true }),
			VehicleEvent.findAll({
				where: { vehicleId },
				order: [['occurredAt', 'DESC']],
				limit: 400,
				raw: true
			}),
			Trip.findAll({
				where: { vehicleId, startedAt: { [Op.gte]: new Date(now.getTime() - 56 * DAY_MS) } },
				order: [['startedAt', 'DESC']],
				raw: true
			}),
			VisitReport.findAll({
				where: { vehicleId },
				order: [['visitedAt', 'DESC']],
				limit: 20,
				raw: true
			})
		]);
	const forecast = forecastCrossing({ readings: input.readings, events: input.events, now });
	const status = statusFromForecast(forecast, now, {
		soonDays: config.FORECAST_SOON_DAYS,
		watchDays: config.FORECAST_WATCH_DAYS
	});
	const usage = summariseUsage(
		trips.map((t) => ({
			start: new Date(t.startedAt),
			end: new Date(t.endedAt),
			distanceKm: t.distanceKm,
			idleMinutes: t.idleMinutes,
			meanSpeedKmh: t.meanSpeedKmh ?? 0
		})),
		now
	);
	const hints = findRootCauseHints(forecast, usage.trips ? usage : null, {
		fuel: vehicle.fuel,
		oilSpec: vehicle.oilGrade ?? undefined
	});
	const advice =
		user.role === 'fleet_manager'
			? adviseFleetManager(vehicle.registration, usage.trips ? usage : null, forecast, status)
			: [];

	const available = SERIES_KINDS.map((kind) => ({
		kind,
		label: SERIES_LABELS[kind],
		count: buildSeries(input.readings, kind).points.length
	})).filter((s) => s.count > 0);
	const chosen =
		options.series && available.some((s) => s.kind === options.series)
			? options.series
			: forecast.series.kind;
	const series = buildSeries(input.readings, chosen);

	return {
		vehicle: {
			id: vehicle.id,
			registration: vehicle.registration,
			vin: vehicle.vin ?? null,
			makeModel: vehicle.makeModel ?? null,
			engineDisplacementCc: vehicle.engineDisplacementCc ?? null,
			emissionClass: vehicle.emissionClass ?? null,
			fuel: vehicle.fuel,
			oilGrade: vehicle.oilGrade ?? null,
			referenceFlowM3h: vehicle.referenceFlowM3h ?? null
		},
		depot: depot ? { id: depot.id, name: depot.name } : null,
		driver: driver ? { id: driver.id, name: driver.name } : null,
		sensorType: sensorType ? { name: sensorType.name } : null,
		status: { status: status.status, label: status.label, description: status.description },
		forecast: forecastView(forecast),
		chart: {
			kind: chosen,
			label: SERIES_LABELS[chosen],
			concernMbar: series.limit.concernMbar,
			available,
			points: series.points.map((p) => ({ at: p.at.toISOString(), mbar: p.deltaPMbar })),
			showsForecast: chosen === forecast.series.kind
		},
		events: events.map((e) => ({
			id: e.id,
			at: iso(e.occurredAt)!,
			kind: e.kind,
			odometerKm: e.odometerKm ?? null,
			notes: e.notes ?? null,
			source: e.source
		})),
		readings: recentReadings.map((r) => ({
			id: r.id,
			at: iso(r.takenAt)!,
			mbar: r.deltaPMbar,
			condition: r.condition,
			odometerKm: r.odometerKm ?? null,
			source: r.source
		})),
		trips: trips.slice(0, 30).map((t) => ({
			id: t.id,
			start: iso(t.startedAt)!,
			end: iso(t.endedAt)!,
			distanceKm: t.distanceKm,
			idleMinutes: t.idleMinutes
		})),
		visits: visits.map((v) => ({
			id: v.id,
			at: iso(v.visitedAt)!,
			findings: v.findings ?? null,
			signedOff: v.signedOffAt !== null
		})),
		usage: usageView(usage),
		hints,
		advice: advice.map((a) => ({ text: a.text, restsOn: a.restsOn }))
	};
}
export type VanStory = Awaited<ReturnType<typeof getVanStory>>;
