import { createHash } from 'node:crypto';
import { Op } from 'sequelize';
import { publicUrl } from '../config';
import { Contract, User, Vehicle } from '../db';
import { renderDigest, type DigestVan } from '../mail/templates/digest';
import { STATUS_LABELS } from '../../domain/status';
import type { PressureUnit } from '../../domain/units';
import type { StoredForecast } from './forecasts';
import { queueMail } from './outbox';
import { isoDay } from './scope';

/** Does this person want to hear about this change? Their settings decide. */
export function wantsChange(
	user: Pick<User, 'notifyStatuses' | 'crossingWindowDays'>,
	change: StoredForecast,
	now: Date
): boolean {
	const statuses = new Set(user.notifyStatuses ?? []);
	if (change.change === 'recovered') return statuses.size > 0;
	if (!statuses.has(change.status)) return false;
	if (change.change === 'entered_window') {
		const expected = change.forecast.crossing.expected;
		return (
			expected !== null &&
			expected.getTime() - now.getTime() <= user.crossingWindowDays * 86_400_000
		);
	}
	return true;
}

/** Fleets each workshop is contracted with today, for the workshops among `workshopIds`. */
async function fleetsByWorkshop(fleetIds: number[], now: Date): Promise<Map<number, Set<number>>> {
	const today = isoDay(now);
	const contracts = await Contract.findAll({
		where: {
			fleetId: { [Op.in]: fleetIds },
			startsOn: { [Op.lte]: today },
			[Op.or]: [{ endsOn: null }, { endsOn: { [Op.gte]: today } }]
		},
		raw: true
	});
	const map = new Map<number, Set<number>>();
	for (const c of contracts) {
		if (!map.has(c.workshopId)) map.set(c.workshopId, new Set());
		map.get(c.workshopId)!.add(c.fleetId);
	}
	return map;
}

/**
 * One digest per recipient per run, listing the vans whose status changed: to the fleet's
 * managers and to the workshops contracted with that fleet. The dedupe key is the run and the
 * person, so re-queuing a run sends nothing twice. Returns how many messages were queued.
 */
export async function queueDigests(
	changes: StoredForecast[],
	now: Date,
	runKey: string
): Promise<number> {
	if (!changes.length) return 0;
	const vans = await Vehicle.findAll({
		where: { id: { [Op.in]: changes.map((c) => c.vehicleId) } },
		raw: true
	});
	const vanById = new Map(vans.map((v) => [v.id, v]));
	const fleetIds = [...new Set(vans.map((v) => v.organisationId))];
	const workshopFleets = await fleetsByWorkshop(fleetIds, now);
	const recipients = await User.findAll({
		where: {
			active: true,
			notifyDigest: true,
			passwordHash: { [Op.ne]: null },
			[Op.or]: [
				{ role: 'fleet_manager', organisationId: { [Op.in]: fleetIds } },
				{ role: 'workshop', organisationId: { [Op.in]: [...workshopFleets.keys()] } }
			]
		}
	});
	let queued = 0;
	for (const user of recipients) {
		const visibleFleets =
			user.role === 'fleet_manager'
				? new Set([user.organisationId])
				: (workshopFleets.get(user.organisationId) ?? new Set());
		const area = user.role === 'fleet_manager' ? 'fleet' : 'workshop';
		const mine = changes.filter(
			(c) =>
				visibleFleets.has(vanById.get(c.vehicleId)!.organisationId) && wantsChange(user, c, now)
		);
		if (!mine.length) continue;
		mine.sort(
			(a, b) =>
				(a.forecast.crossing.expected?.getTime() ?? Infinity) -
				(b.forecast.crossing.expected?.getTime() ?? Infinity)
		);
		const digestVans: DigestVan[] = mine.map((c) => ({
			registration: vanById.get(c.vehicleId)!.registration,
			link: `${publicUrl()}/${area}/vans/${c.vehicleId}`,
			change: c.change!,
			statusLabel: STATUS_LABELS[c.status],
			latestMbar: c.forecast.series.lastReadingMbar,
			concernMbar: c.forecast.series.concernMbar,
			growthMbarPerWeek: c.forecast.growth?.mbarPerWeek ?? null,
			earliest: c.forecast.crossing.earliest,
			expected: c.forecast.crossing.expected,
			latest: c.forecast.crossing.latest,
			intervalLevel: c.forecast.crossing.level,
			confidence: c.forecast.confidence.grade,
			explanation: c.forecast.explanation
		}));
		const message = renderDigest({
			name: user.name,
			vans: digestVans,
			unit: user.unitPreference as PressureUnit,
			locale: user.locale,
			timeZone: user.timeZone,
			settingsLink: `${publicUrl()}/settings`
		});
		const changeHash = createHash('sha256')
			.update(mine.map((c) => `${c.vehicleId}:${c.status}`).join(','))
			.digest('hex')
			.slice(0, 12);
		const added = await queueMail(
			{
				recipient: user.email,
				subject: message.subject,
				text: message.text,
				html: message.html,
				dedupeKey: `digest:${runKey}:${user.id}:${changeHash}`
			},
			now
		);
		if (added) queued++;
	}
	return queued;
}
