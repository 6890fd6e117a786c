import { Op } from 'sequelize';
import {
	getDb,
	serializeOn,
	BookingSlot,
	WorkshopCapacity,
	WorkshopClosedDay,
	WorkshopVisitKind
} from '../db';
import type { SessionUser } from '../auth/lucia';
import {
	DEFAULT_VISIT_MINUTES,
	VISIT_KINDS,
	VISIT_KIND_LABEL,
	minutesOfDay,
	type VisitKind
} from '../../domain/visits';
import {
	minutesField,
	offeredField,
	type CapacityHoursInput,
	type ClosedDayInput,
	type VisitKindsInput
} from '../../validation/capacity';
import { getCapacity, toLocal, workshopBookingsTopic, type Capacity } from './bookings';
import { ForbiddenError, NotFoundError, ValidationError } from './errors';
import { recordAudit } from './audit';
import {
	compactBays,
	hoursConflicts,
	longestMisfit,
	nameBookings,
	standingBookings,
	visits
} from './capacity-conflicts';

const DAY_MS = 86_400_000;
/** How far ahead a closed day may be set; further is most likely a typo in the year. */
const CLOSED_DAY_HORIZON_DAYS = 2 * 366;

function ownWorkshop(user: SessionUser): number {
	if (user.role !== 'workshop')
		throw new ForbiddenError("Only the workshop's own people change its capacity.");
	return user.organisationId;
}

const localDay = (at: Date, timeZone: string) => toLocal(at, timeZone).slice(0, 10);

export interface CapacitySettings {
	capacity: Capacity;
	/** The workshop's local date now, 'YYYY-MM-DD'. */
	today: string;
	closedDays: { id: number; day: string; note: string | null }[];
	kinds: { kind: VisitKind; label: string; durationMinutes: number; offered: boolean }[];
}

/** What the capacity page shows: the saved settings, upcoming closed days and every standard kind. */
export async function capacitySettings(user: SessionUser, now: Date): Promise<CapacitySettings> {
	const capacity = await getCapacity(ownWorkshop(user));
	const today = localDay(now, capacity.timeZone);
	const closed = await WorkshopClosedDay.findAll({
		where: { workshopId: capacity.workshopId, day: { [Op.gte]: today } },
		order: [['day', 'ASC']]
	});
	return {
		capacity,
		today,
		closedDays: closed.map((c) => ({ id: c.id, day: c.day, note: c.note })),
		kinds: VISIT_KINDS.map((kind) => {
			const offered = capacity.kinds.find((k) => k.kind === kind);
			return {
				kind,
				label: VISIT_KIND_LABEL[kind],
				durationMinutes: offered?.durationMinutes ?? DEFAULT_VISIT_MINUTES[kind],
				offered: Boolean(offered)
			};
		})
	};
}

const REFUSED = 'Not saved: these settings would break visits already booked.';

/** Saves bays, hours, open weekdays and zone, refusing a change that breaks standing bookings. */
export async function saveHours(user: SessionUser, input: CapacityHoursInput, now: Date) {
	const workshopId = ownWorkshop(user);
	await getDb().transaction(async () => {
		await serializeOn(getDb(), workshopBookingsTopic(workshopId));
		const cap = await getCapacity(workshopId);
		const closedWeekdays = [1, 2, 3, 4, 5, 6, 7].filter((d) => !input.openDays.includes(d));
		const misfit = longestMisfit(cap.kinds, input.opensAt, input.closesAt);
		if (misfit) {
			const msg = `Open ${input.opensAt}–${input.closesAt} is shorter than the longest visit you offer: ${VISIT_KIND_LABEL[misfit.kind].toLowerCase()} takes ${misfit.durationMinutes} minutes.`;
			throw new ValidationError(msg, { closesAt: msg });
		}
		const today = localDay(now, cap.timeZone);
		const slots = await BookingSlot.findAll({
			where: { workshopId, day: { [Op.gte]: today } },
			attributes: ['day']
		});
		const perDay = new Map<string, number>();
		for (const s of slots) perDay.set(s.day, (perDay.get(s.day) ?? 0) + 1);
		const standing = await standingBookings(workshopId, now);
		const fields = hoursConflicts(input, closedWeekdays, standing, perDay, cap.timeZone);
		if (Object.keys(fields).length) throw new ValidationError(REFUSED, fields);

		const after = {
			baysPerDay: input.baysPerDay,
			opensAt: input.opensAt,
			closesAt: input.closesAt,
			closedWeekdays,
			timeZone: input.timeZone
		};
		await compactBays(workshopId, today, input.baysPerDay);
		const row = await WorkshopCapacity.findByPk(workshopId);
		if (row) await row.update(after);
		else await WorkshopCapacity.create({ workshopId, ...after });
		const before = {
			baysPerDay: cap.baysPerDay,
			opensAt: cap.opensAt,
			closesAt: cap.closesAt,
			closedWeekdays: cap.closedWeekdays,
			timeZone: cap.timeZone
		};
		await recordAudit(user, 'capacity.hours_saved', 'workshop', workshopId, { before, after }, now);
	});
}

/** Closes the workshop on one local date; refused when visits are already booked that day. */
export async function addClosedDay(user: SessionUser, input: ClosedDayInput, now: Date) {
	const workshopId = ownWorkshop(user);
	const fail = (msg: string): never => {
		throw new ValidationError(msg, { day: msg });
	};
	return getDb().transaction(async () => {
		await serializeOn(getDb(), workshopBookingsTopic(workshopId));
		const cap = await getCapacity(workshopId);
		const today = localDay(now, cap.timeZone);
		if (input.day < today)
			fail(`${input.day} has already passed. Choose today (${today}) or a later date.`);
		const horizon = new Date(Date.parse(`${today}T12:00:00Z`) + CLOSED_DAY_HORIZON_DAYS * DAY_MS);
		if (input.day > horizon.toISOString().slice(0, 10))
			fail('Choose a date within the next two years.');
		const already = cap.closedDays.find((c) => c.day === input.day);
		if (already)
			fail(`You are already closed on ${input.day}${already.note ? ` (${already.note})` : ''}.`);
		const onDay = (await standingBookings(workshopId, now)).filter(
			(b) => (b.day ?? localDay(b.startsAt, cap.timeZone)) === input.day
		);
		if (onDay.length)
			fail(
				`${input.day} already has ${visits(onDay.length)} booked: ${nameBookings(onDay, cap.timeZone)}. Move or cancel ${onDay.length === 1 ? 'it' : 'them'} first.`
			);
		const row = await WorkshopClosedDay.create({ workshopId, day: input.day, note: input.note });
		await recordAudit(
			user,
			'capacity.closed_day_added',
			'workshop_closed_day',
			row.id,
			{ day: input.day, note: input.note },
			now
		);
		return { id: row.id, day: row.day, note: row.note };
	});
}

export async function getClosedDay(user: SessionUser, closedDayId: number) {
	const row = await WorkshopClosedDay.findOne({
		where: { id: closedDayId, workshopId: ownWorkshop(user) }
	});
	if (!row) throw new NotFoundError('That closed day');
	return { id: row.id, day: row.day, note: row.note };
}

/** Opens a closed day again; only the workshop's own days, anyone else's is "not found". */
export async function removeClosedDay(user: SessionUser, closedDayId: number, now: Date) {
	const closed = await getClosedDay(user, closedDayId);
	await getDb().transaction(async () => {
		await WorkshopClosedDay.destroy({ where: { id: closed.id, workshopId: user.organisationId } });
		await recordAudit(
			user,
			'capacity.closed_day_removed',
			'workshop_closed_day',
			closed.id,
			{ day: closed.day, note: closed.note },
			now
		);
	});
	return closed;
}

/**
 * Saves which standard kinds are offered and their lengths. Booked visits keep their times; a
 * kind still booked cannot be withdrawn, as those visits could then not be moved.
 */
export async function saveVisitKinds(user: SessionUser, input: VisitKindsInput, now: Date) {
	const workshopId = ownWorkshop(user);
	await getDb().transaction(async () => {
		await serializeOn(getDb(), workshopBookingsTopic(workshopId));
		const cap = await getCapacity(workshopId);
		const fields: Record<string, string> = {};
		const open = minutesOfDay(cap.closesAt) - minutesOfDay(cap.opensAt);
		for (const k of input.filter((k) => k.offered && k.durationMinutes > open))
			fields[minutesField(k.kind)] =
				`${k.durationMinutes} minutes do not fit in your opening hours (${cap.opensAt}–${cap.closesAt}, ${open} minutes).`;
		const standing = await standingBookings(workshopId, now);
		for (const k of input.filter((k) => !k.offered)) {
			const booked = standing.filter((b) => b.visitKind === k.kind);
			if (booked.length)
				fields[offeredField(k.kind)] =
					`${VISIT_KIND_LABEL[k.kind]} is still booked: ${nameBookings(booked, cap.timeZone)}. Keep offering it until those visits are done or cancelled.`;
		}
		if (Object.keys(fields).length)
			throw new ValidationError('Not saved: see the message beside each visit kind.', fields);

		const rows = await WorkshopVisitKind.findAll({ where: { workshopId } });
		for (const k of input) {
			const row = rows.find((r) => r.kind === k.kind);
			if (!k.offered) await row?.destroy();
			else if (row) await row.update({ durationMinutes: k.durationMinutes });
			else
				await WorkshopVisitKind.create({
					workshopId,
					kind: k.kind,
					durationMinutes: k.durationMinutes
				});
		}
		const before = cap.kinds.map((k) => ({ kind: k.kind, durationMinutes: k.durationMinutes }));
		const after = input
			.filter((k) => k.offered)
			.map((k) => ({ kind: k.kind, durationMinutes: k.durationMinutes }));
		await recordAudit(
			user,
			'capacity.visit_kinds_saved',
			'workshop',
			workshopId,
			{ before, after },
			now
		);
	});
}
