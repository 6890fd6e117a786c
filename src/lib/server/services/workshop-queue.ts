import { Op } from 'sequelize';
import { forecastCrossing } from '../../domain/forecast';
import { findRootCauseHints } from '../../domain/root-cause';
import { summariseUsage } from '../../domain/usage';
import { SensorTest, Trip, Vehicle } from '../db';
import type { SessionUser } from '../auth/lucia';
import type { BoardQueryInput } from '../../validation/board';
import { listBoard } from './board';
import { loadEngineInputs } from './forecasts';

const DAY_MS = 86_400_000;

/**
 * The workshop's queue: contracted fleets' vans by urgency, each with what to check (the
 * root-cause hints) and its latest sensor test. Hints are computed for the page shown only.
 */
export async function workshopQueue(user: SessionUser, query: BoardQueryInput, now = new Date()) {
	const board = await listBoard(user, { ...query, sort: 'urgency', dir: 'asc' });
	const ids = board.items.map((v) => v.id);
	if (!ids.length) return { ...board, items: [] };
	const since = new Date(now.getTime() - 28 * DAY_MS);
	const [inputs, trips, tests, vans] = await Promise.all([
		loadEngineInputs(ids),
		Trip.findAll({
			where: { vehicleId: { [Op.in]: ids }, startedAt: { [Op.gte]: since, [Op.lte]: now } },
			raw: true
		}),
		SensorTest.findAll({
			where: { vehicleId: { [Op.in]: ids } },
			order: [['testedAt', 'DESC']],
			raw: true
		}),
		Vehicle.findAll({
			where: { id: { [Op.in]: ids } },
			attributes: ['id', 'fuel', 'oilGrade'],
			raw: true
		})
	]);
	const items = board.items.map((van) => {
		const input = inputs.get(van.id)!;
		const vanTrips = trips
			.filter((t) => t.vehicleId === van.id)
			.map((t) => ({
				start: new Date(t.startedAt),
				end: new Date(t.endedAt),
				distanceKm: t.distanceKm,
				idleMinutes: t.idleMinutes,
				meanSpeedKmh: t.meanSpeedKmh ?? 0
			}));
		const usage = vanTrips.length ? summariseUsage(vanTrips, now) : null;
		const profile = vans.find((v) => v.id === van.id);
		const hints = input.readings.length
			? findRootCauseHints(
					forecastCrossing({ readings: input.readings, events: input.events, now }),
					usage,
					{
						fuel: profile?.fuel,
						oilSpec: profile?.oilGrade ?? undefined
					}
				)
			: [];
		const latest = tests.find((t) => t.vehicleId === van.id);
		return {
			...van,
			checks: hints.map((h) => ({ title: h.title, restsOn: h.restsOn })),
			latestTest: latest
				? {
						id: latest.id,
						kind: latest.kind,
						verdict: latest.verdict,
						testedAt: new Date(latest.testedAt).toISOString()
					}
				: null
		};
	});
	return { ...board, items };
}
