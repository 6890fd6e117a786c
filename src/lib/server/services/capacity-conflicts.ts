/**
 * What a capacity change would break: the bookings that hold a bay and are not over yet, and
 * the checks of new hours against them. Used by workshop-capacity.ts inside its transaction.
 */
import { Op } from 'sequelize';
import { Booking, BookingSlot, Vehicle } from '../db';
import { OPEN_BOOKING_STATES, minutesOfDay, type VisitKind } from '../../domain/visits';
import type { CapacityHoursInput } from '../../validation/capacity';
import { toLocal } from './bookings';

const isoWeekday = (day: string) => new Date(`${day}T12:00:00Z`).getUTCDay() || 7;

export interface Standing {
	id: number;
	registration: string;
	state: string;
	visitKind: string;
	startsAt: Date;
	endsAt: Date;
	/** The day of the bay it holds, in the workshop's current zone. */
	day: string | null;
}

/** Bookings that hold a bay and have not finished yet: the ones a change could break. */
export async function standingBookings(workshopId: number, now: Date): Promise<Standing[]> {
	const rows = await Booking.findAll({
		where: {
			workshopId,
			state: { [Op.in]: [...OPEN_BOOKING_STATES] },
			endsAt: { [Op.gt]: now }
		},
		include: [{ model: Vehicle, as: 'vehicle', attributes: ['registration'] }],
		order: [
			['startsAt', 'ASC'],
			['id', 'ASC']
		]
	});
	const slots = await BookingSlot.findAll({
		where: { bookingId: { [Op.in]: rows.map((b) => b.id) } },
		attributes: ['bookingId', 'day']
	});
	const dayOf = new Map(slots.map((s) => [s.bookingId, s.day]));
	return rows
		.filter((b) => b.startsAt && b.endsAt)
		.map((b) => ({
			id: b.id,
			registration: (b as Booking & { vehicle?: Vehicle }).vehicle?.registration ?? '',
			state: b.state,
			visitKind: b.visitKind,
			startsAt: b.startsAt!,
			endsAt: b.endsAt!,
			day: dayOf.get(b.id) ?? null
		}));
}

/** "BHP 1 on 2026-12-03 10:00 (confirmed)", and a cap on how many are named in one message. */
export function nameBookings(list: Standing[], timeZone: string): string {
	const shown = list
		.slice(0, 5)
		.map(
			(b) => `${b.registration} on ${toLocal(b.startsAt, timeZone).replace('T', ' ')} (${b.state})`
		);
	const more = list.length - shown.length;
	return shown.join(', ') + (more > 0 ? ` and ${more} more` : '');
}

export const visits = (n: number) => `${n} visit${n === 1 ? '' : 's'}`;

/** The longest visit offered must fit between opening and closing. */
export function longestMisfit(
	kinds: { kind: VisitKind; durationMinutes: number }[],
	opensAt: string,
	closesAt: string
) {
	const open = minutesOfDay(closesAt) - minutesOfDay(opensAt);
	return [...kinds]
		.sort((a, b) => b.durationMinutes - a.durationMinutes)
		.find((k) => k.durationMinutes > open);
}

/**
 * Which standing bookings the new bays, hours, open days or zone would break, as messages per
 * field. A booking breaks when it would fall on a closed weekday, outside the hours, on another
 * local day than the bay it holds (a zone change), or on a day with more visits than bays.
 */
export function hoursConflicts(
	input: CapacityHoursInput,
	closedWeekdays: number[],
	standing: Standing[],
	slotsPerDay: Map<string, number>,
	oldZone: string
): Record<string, string> {
	const off: Standing[] = [];
	const outside: Standing[] = [];
	const moved: Standing[] = [];
	for (const b of standing) {
		const local = toLocal(b.startsAt, input.timeZone);
		const day = local.slice(0, 10);
		const start = minutesOfDay(local.slice(11));
		const end = start + Math.round((b.endsAt.getTime() - b.startsAt.getTime()) / 60_000);
		if (closedWeekdays.includes(isoWeekday(day))) off.push(b);
		else if (b.day && day !== b.day) moved.push(b);
		else if (start < minutesOfDay(input.opensAt) || end > minutesOfDay(input.closesAt))
			outside.push(b);
	}
	const fields: Record<string, string> = {};
	if (off.length)
		fields.openDays = `${visits(off.length)} would fall on a day you close: ${nameBookings(off, input.timeZone)}.`;
	if (outside.length)
		fields.opensAt = `${visits(outside.length)} would fall outside ${input.opensAt}–${input.closesAt}: ${nameBookings(outside, input.timeZone)}.`;
	if (moved.length)
		fields.timeZone = `In ${input.timeZone} time ${visits(moved.length)} would move to another day: ${nameBookings(moved, input.timeZone)}.`;
	const crowded = [...slotsPerDay].filter(([, n]) => n > input.baysPerDay).map(([day]) => day);
	if (crowded.length) {
		const onCrowded = standing.filter((b) => b.day && crowded.includes(b.day));
		fields.baysPerDay = `${crowded.join(', ')} already ${crowded.length === 1 ? 'has' : 'have'} more than ${input.baysPerDay} bay${input.baysPerDay === 1 ? '' : 's'} booked: ${nameBookings(onCrowded, oldZone)}.`;
	}
	return fields;
}

/** Bay numbers above the new count move down into free ones, so a day's bays stay 1…n. */
export async function compactBays(workshopId: number, fromDay: string, baysPerDay: number) {
	const high = await BookingSlot.findAll({
		where: { workshopId, day: { [Op.gte]: fromDay }, bay: { [Op.gt]: baysPerDay } }
	});
	for (const slot of high) {
		const used = new Set(
			(
				await BookingSlot.findAll({ where: { workshopId, day: slot.day }, attributes: ['bay'] })
			).map((s) => s.bay)
		);
		const free = Array.from({ length: baysPerDay }, (_, i) => i + 1).find((b) => !used.has(b));
		// Counted beforehand: every crowded day was refused, so a free bay exists.
		if (free === undefined) throw new Error(`No free bay on ${slot.day} after the count`);
		slot.bay = free;
		await slot.save();
	}
}
