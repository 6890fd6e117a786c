import { randomUUID } from 'node:crypto';
import { Op, UniqueConstraintError } from 'sequelize';
import { TZDate } from '@date-fns/tz';
import {
	getDb,
	Booking,
	BookingChange,
	BookingSlot,
	Contract,
	Organisation,
	User,
	Vehicle,
	VehicleStatus,
	WorkshopCapacity,
	WorkshopClosedDay,
	WorkshopVisitKind,
	serializeOn,
	together
} from '../db';
import type { SessionUser } from '../auth/lucia';
import {
	DEFAULT_VISIT_MINUTES,
	OPEN_BOOKING_STATES,
	VISIT_KINDS,
	VISIT_KIND_LABEL,
	WEEKDAY_NAMES,
	minutesOfDay,
	suggestedVisitWindow,
	type VisitWindow,
	type VisitKind
} from '../../domain/visits';
import type { BookingState } from '../../domain/vocabulary';
import { ValidationError, NotFoundError, ForbiddenError } from './errors';
import { contractedFleetIds, isoDay } from './scope';
import { recordAudit } from './audit';
import { sendBookingMail } from './booking-mail';

const DAY_MS = 86_400_000;

/**
 * Used when a workshop has not set its own capacity (the demo seeder stores these for the demo
 * workshops too): two bays, 08:00–17:00 local time, closed at weekends.
 */
export const DEFAULT_CAPACITY = {
	baysPerDay: 2,
	opensAt: '08:00',
	closesAt: '17:00',
	closedWeekdays: [6, 7],
	timeZone: 'Europe/London'
};

export interface Capacity {
	workshopId: number;
	workshopName: string;
	baysPerDay: number;
	opensAt: string;
	closesAt: string;
	closedWeekdays: number[];
	timeZone: string;
	closedDays: { day: string; note: string | null }[];
	kinds: { kind: VisitKind; label: string; durationMinutes: number }[];
	isDefault: boolean;
}

/** The serializeOn topic shared by a workshop's bookings and its capacity changes. */
export const workshopBookingsTopic = (workshopId: number) => `workshop-bookings:${workshopId}`;

export async function getCapacity(workshopId: number): Promise<Capacity> {
	const [org, row, closed, kinds] = await together(
		() => Organisation.findByPk(workshopId),
		() => WorkshopCapacity.findByPk(workshopId),
		() => WorkshopClosedDay.findAll({ where: { workshopId }, order: [['day', 'ASC']] }),
		() => WorkshopVisitKind.findAll({ where: { workshopId } })
	);
	if (!org || org.kind !== 'workshop') throw new NotFoundError('That workshop');
	const base = row ? row.get({ plain: true }) : { ...DEFAULT_CAPACITY, workshopId };
	const offered = kinds.length
		? kinds
				.filter((k) => (VISIT_KINDS as readonly string[]).includes(k.kind))
				.map((k) => ({ kind: k.kind as VisitKind, durationMinutes: k.durationMinutes }))
		: VISIT_KINDS.map((kind) => ({ kind, durationMinutes: DEFAULT_VISIT_MINUTES[kind] }));
	return {
		workshopId,
		workshopName: org.name,
		baysPerDay: base.baysPerDay,
		opensAt: base.opensAt,
		closesAt: base.closesAt,
		closedWeekdays: base.closedWeekdays,
		timeZone: base.timeZone,
		closedDays: closed.map((c) => ({ day: c.day, note: c.note })),
		kinds: offered.map((k) => ({ ...k, label: VISIT_KIND_LABEL[k.kind] })),
		isDefault: !row
	};
}

/** A wall-clock 'YYYY-MM-DDTHH:MM' in `timeZone` as an instant. */
export function fromLocal(local: string, timeZone: string): Date {
	const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})/.exec(local);
	if (!m)
		throw new ValidationError('Enter the date and time of the visit.', {
			startsAt: 'Enter the date and time of the visit.'
		});
	const [, y, mo, d, h, mi] = m.map(Number);
	return new Date(new TZDate(y, mo - 1, d, h, mi, timeZone).getTime());
}

/** An instant as 'YYYY-MM-DDTHH:MM' wall-clock time in `timeZone` (for datetime-local inputs). */
export function toLocal(at: Date, timeZone: string): string {
	const z = new TZDate(at.getTime(), timeZone);
	const p = (n: number) => String(n).padStart(2, '0');
	return `${z.getFullYear()}-${p(z.getMonth() + 1)}-${p(z.getDate())}T${p(z.getHours())}:${p(z.getMinutes())}`;
}

const localDay = (at: Date, timeZone: string) => toLocal(at, timeZone).slice(0, 10);

const failStart = (message: string): never => {
	throw new ValidationError(message, { startsAt: message });
};

/**
 * Checks a visit time against the workshop's rules (not in the past, on an open day, within
 * opening hours) and returns its end. Capacity is checked separately, inside the transaction.
 */
export function checkVisitTime(
	cap: Capacity,
	kind: VisitKind,
	startsAt: Date,
	now: Date
): { endsAt: Date; day: string } {
	const offered = cap.kinds.find((k) => k.kind === kind);
	if (!offered)
		throw new ValidationError(`${cap.workshopName} does not offer this kind of visit.`, {
			visitKind: `${cap.workshopName} does not offer this kind of visit.`
		});
	if (startsAt.getTime() <= now.getTime())
		failStart('That time has already passed. Choose a time later than now.');
	const endsAt = new Date(startsAt.getTime() + offered.durationMinutes * 60_000);
	const z = new TZDate(startsAt.getTime(), cap.timeZone);
	const isoWeekday = z.getDay() === 0 ? 7 : z.getDay();
	const day = localDay(startsAt, cap.timeZone);
	if (cap.closedWeekdays.includes(isoWeekday))
		failStart(
			`${cap.workshopName} is closed on ${WEEKDAY_NAMES[isoWeekday - 1]}. Choose another day.`
		);
	const closed = cap.closedDays.find((c) => c.day === day);
	if (closed)
		failStart(
			`${cap.workshopName} is closed on ${day}${closed.note ? ` (${closed.note})` : ''}. Choose another day.`
		);
	const startMin = z.getHours() * 60 + z.getMinutes();
	const endMin = startMin + offered.durationMinutes;
	if (startMin < minutesOfDay(cap.opensAt) || endMin > minutesOfDay(cap.closesAt)) {
		failStart(
			`${cap.workshopName} is open ${cap.opensAt}–${cap.closesAt} (${cap.timeZone} time); a ${offered.durationMinutes}-minute ${VISIT_KIND_LABEL[kind].toLowerCase()} must start and finish within those hours.`
		);
	}
	return { endsAt, day };
}

/**
 * Takes a free bay on `day` for the booking. Must run inside the caller's transaction: the count
 * and the insert are one unit (SQLite serialises IMMEDIATE transactions), and the unique
 * (workshop, day, bay) index refuses a second holder of the same bay on any database.
 */
async function holdBay(cap: Capacity, bookingId: number, day: string): Promise<void> {
	const full = () =>
		failStart(
			`All ${cap.baysPerDay} bays at ${cap.workshopName} are taken on ${day}. Choose another day.`
		);
	await BookingSlot.destroy({ where: { bookingId } });
	const taken = await BookingSlot.findAll({
		where: { workshopId: cap.workshopId, day },
		attributes: ['bay']
	});
	const used = new Set(taken.map((s) => s.bay));
	let bay = 0;
	for (let b = 1; b <= cap.baysPerDay; b++)
		if (!used.has(b)) {
			bay = b;
			break;
		}
	if (!bay) full();
	try {
		await BookingSlot.create({ bookingId, workshopId: cap.workshopId, day, bay });
	} catch (err) {
		if (err instanceof UniqueConstraintError) full();
		throw err;
	}
}

async function hasActiveContract(fleetId: number, workshopId: number, now: Date): Promise<boolean> {
	return (await contractedFleetIds(workshopId, now)).includes(fleetId);
}

export interface BookingView {
	id: number;
	uid: string;
	vehicleId: number;
	registration: string;
	workshopId: number;
	workshopName: string;
	visitKind: VisitKind;
	visitKindLabel: string;
	state: BookingState;
	startsAt: Date | null;
	endsAt: Date | null;
	windowFrom: Date | null;
	windowTo: Date | null;
	sequence: number;
	reason: string | null;
	timeZone: string;
	/** The start as wall-clock time in the workshop's zone, for the reschedule form. */
	startsAtLocal: string;
	changes: {
		at: Date;
		who: string;
		action: string;
		toState: string;
		startsAt: Date | null;
		reason: string | null;
	}[];
}

/** Bookings this person may see: a fleet manager's own fleet's, a workshop's own. */
function bookingScope(user: SessionUser): {
	booking: Record<string, unknown>;
	vehicle: Record<string, unknown>;
} {
	if (user.role === 'workshop')
		return { booking: { workshopId: user.organisationId }, vehicle: {} };
	if (user.role === 'fleet_manager')
		return { booking: {}, vehicle: { organisationId: user.organisationId } };
	return { booking: { id: { [Op.in]: [] as number[] } }, vehicle: {} };
}

export async function listBookings(
	user: SessionUser,
	filter: { vehicleId?: number; from?: Date; to?: Date } = {}
): Promise<BookingView[]> {
	const scope = bookingScope(user);
	const where: Record<string, unknown> = { ...scope.booking };
	if (filter.vehicleId) where.vehicleId = filter.vehicleId;
	if (filter.from && filter.to) where.startsAt = { [Op.gte]: filter.from, [Op.lt]: filter.to };
	const rows = await Booking.findAll({
		where,
		include: [
			{
				model: Vehicle,
				as: 'vehicle',
				attributes: ['id', 'registration', 'organisationId'],
				where: scope.vehicle,
				required: true
			}
		],
		order: [
			['startsAt', 'ASC'],
			['id', 'ASC']
		],
		limit: 500
	});
	return Promise.all(rows.map((b) => view(b)));
}

export async function getBooking(user: SessionUser, bookingId: number): Promise<BookingView> {
	return view(await findBooking(user, bookingId));
}

async function findBooking(user: SessionUser, bookingId: number): Promise<Booking> {
	const scope = bookingScope(user);
	const b = await Booking.findOne({
		where: { id: bookingId, ...scope.booking },
		include: [
			{
				model: Vehicle,
				as: 'vehicle',
				attributes: ['id', 'registration', 'organisationId'],
				where: scope.vehicle,
				required: true
			}
		]
	});
	if (!b) throw new NotFoundError('That visit');
	return b;
}

async function view(b: Booking): Promise<BookingView> {
	const [vehicle, workshop, cap, changes] = await together(
		() => Vehicle.findByPk(b.vehicleId, { attributes: ['registration'] }),
		() => Organisation.findByPk(b.workshopId, { attributes: ['name'] }),
		() => WorkshopCapacity.findByPk(b.workshopId, { attributes: ['timeZone'] }),
		() => BookingChange.findAll({ where: { bookingId: b.id }, order: [['id', 'ASC']] })
	);
	const people = await User.findAll({
		where: { id: { [Op.in]: changes.map((c) => c.userId).filter((x): x is number => x !== null) } },
		attributes: ['id', 'name']
	});
	const nameOf = new Map(people.map((p) => [p.id, p.name]));
	return {
		id: b.id,
		uid: b.uid,
		vehicleId: b.vehicleId,
		registration: vehicle?.registration ?? '',
		workshopId: b.workshopId,
		workshopName: workshop?.name ?? '',
		visitKind: b.visitKind as VisitKind,
		visitKindLabel: VISIT_KIND_LABEL[b.visitKind as VisitKind] ?? b.visitKind,
		state: b.state,
		startsAt: b.startsAt,
		endsAt: b.endsAt,
		windowFrom: b.windowFrom,
		windowTo: b.windowTo,
		sequence: b.sequence,
		reason: b.reason,
		timeZone: cap?.timeZone ?? DEFAULT_CAPACITY.timeZone,
		startsAtLocal: b.startsAt
			? toLocal(b.startsAt, cap?.timeZone ?? DEFAULT_CAPACITY.timeZone)
			: '',
		changes: changes.map((c) => ({
			at: c.at,
			who: c.userId ? (nameOf.get(c.userId) ?? '') : 'Sootcast',
			action: c.action,
			toState: c.toState,
			startsAt: c.startsAt,
			reason: c.reason
		}))
	};
}

/** The window to suggest for a van's visit (`suggestedVisitWindow`), from its current forecast. */
export async function suggestWindow(
	vehicleId: number,
	now: Date
): Promise<VisitWindow & { crossingEarliest: Date | null; overLine: boolean }> {
	const status = await VehicleStatus.findByPk(vehicleId, {
		attributes: ['crossingEarliest', 'status']
	});
	const crossingEarliest = status?.crossingEarliest ? new Date(status.crossingEarliest) : null;
	const overLine = status?.status === 'over_line';
	return {
		...suggestedVisitWindow(now, { crossingEarliest, overLine }),
		crossingEarliest,
		overLine
	};
}

/** The workshops a fleet may book: those with a contract active today. */
export async function bookableWorkshops(fleetId: number, now: Date): Promise<Capacity[]> {
	const today = isoDay(now);
	const contracts = await Contract.findAll({
		where: {
			fleetId,
			startsOn: { [Op.lte]: today },
			[Op.or]: [{ endsOn: null }, { endsOn: { [Op.gte]: today } }]
		}
	});
	return Promise.all([...new Set(contracts.map((c) => c.workshopId))].map((id) => getCapacity(id)));
}

export interface VisitRequestInput {
	vehicleId: number;
	workshopId: number;
	visitKind: VisitKind;
	/** Wall-clock time in the workshop's zone, 'YYYY-MM-DDTHH:MM'. */
	startsAt: string;
	note?: string;
}

async function record(
	b: Booking,
	user: SessionUser | null,
	action: string,
	fromState: string | null,
	now: Date
) {
	await BookingChange.create({
		bookingId: b.id,
		userId: user?.id ?? null,
		at: now,
		action,
		fromState,
		toState: b.state,
		startsAt: b.startsAt,
		endsAt: b.endsAt,
		sequence: b.sequence,
		reason: b.reason
	});
	await recordAudit(
		user,
		`booking.${action}`,
		'booking',
		b.id,
		{ state: b.state, sequence: b.sequence },
		now
	);
}

/** A fleet manager asks a contracted workshop for a visit; the request holds a bay. */
export async function requestVisit(
	user: SessionUser,
	input: VisitRequestInput,
	now = new Date()
): Promise<BookingView> {
	if (user.role !== 'fleet_manager')
		throw new ForbiddenError('Only fleet managers request visits.');
	const vehicle = await Vehicle.findOne({
		where: { id: input.vehicleId, organisationId: user.organisationId }
	});
	if (!vehicle) throw new NotFoundError('That van');
	const workshop = await Organisation.findByPk(input.workshopId);
	if (!workshop || workshop.kind !== 'workshop')
		throw new ValidationError('Choose a workshop.', { workshopId: 'Choose a workshop.' });
	if (!(await hasActiveContract(vehicle.organisationId, workshop.id, now))) {
		const msg = `${workshop.name} has no active contract with your fleet, so it cannot take ${vehicle.registration}.`;
		throw new ValidationError(msg, { workshopId: msg });
	}
	const window = await suggestWindow(vehicle.id, now);
	const booking = await getDb().transaction(async () => {
		// One booking change per van and per workshop at a time, on every instance.
		await serializeOn(getDb(), `van-bookings:${vehicle.id}`);
		await serializeOn(getDb(), workshopBookingsTopic(workshop.id));
		// Read inside the transaction: a capacity change saved meanwhile is the one applied.
		const cap = await getCapacity(workshop.id);
		const startsAt = fromLocal(input.startsAt, cap.timeZone);
		const { endsAt, day } = checkVisitTime(cap, input.visitKind, startsAt, now);
		const open = await Booking.findOne({
			where: { vehicleId: vehicle.id, state: { [Op.in]: [...OPEN_BOOKING_STATES] } }
		});
		if (open) {
			const msg = `${vehicle.registration} already has an open visit; reschedule or cancel that one instead.`;
			throw new ValidationError(msg, { startsAt: msg });
		}
		const b = await Booking.create({
			uid: `${randomUUID()}@sootcast`,
			vehicleId: vehicle.id,
			workshopId: workshop.id,
			requestedById: user.id,
			visitKind: input.visitKind,
			state: 'requested',
			startsAt,
			endsAt,
			windowFrom: window.from,
			windowTo: window.to,
			sequence: 0,
			reason: input.note?.trim() || null
		});
		await holdBay(cap, b.id, day);
		await record(b, user, 'requested', null, now);
		return b;
	});
	await sendBookingMail(booking.id, now);
	return getBooking(user, booking.id);
}

function refuseClosed(b: Booking): void {
	if (b.state === 'cancelled')
		throw new ValidationError(
			'This visit was cancelled, so it cannot be changed. Request a new visit instead.'
		);
	if (b.state === 'declined')
		throw new ValidationError(
			'The workshop declined this visit, so it cannot be changed. Request a new visit instead.'
		);
	if (b.state === 'done')
		throw new ValidationError(
			'This visit has taken place and has its report; it cannot be changed.'
		);
}

async function change(
	user: SessionUser,
	bookingId: number,
	now: Date,
	work: (b: Booking) => Promise<string>
): Promise<BookingView> {
	await getDb().transaction(async () => {
		await serializeOn(getDb(), `booking:${bookingId}`);
		const b = await findBooking(user, bookingId);
		await serializeOn(getDb(), workshopBookingsTopic(b.workshopId));
		refuseClosed(b);
		const fromState = b.state;
		const action = await work(b);
		b.sequence += 1;
		await b.save();
		await record(b, user, action, fromState, now);
	});
	await sendBookingMail(bookingId, now);
	return getBooking(user, bookingId);
}

/** The workshop accepts a request, or the fleet manager accepts the workshop's proposed time. */
export function confirmBooking(user: SessionUser, bookingId: number, now = new Date()) {
	return change(user, bookingId, now, async (b) => {
		const mine = user.role === 'workshop' ? b.state === 'requested' : b.state === 'proposed';
		if (b.state === 'confirmed') throw new ValidationError('This visit is already confirmed.');
		if (!mine)
			throw new ValidationError(
				user.role === 'workshop'
					? 'The fleet has not accepted your proposed time yet.'
					: 'The workshop has not answered this request yet.'
			);
		if (
			!(await hasActiveContract(
				(await Vehicle.findByPk(b.vehicleId))!.organisationId,
				b.workshopId,
				now
			))
		) {
			throw new ValidationError(
				'The contract between the fleet and the workshop has ended, so this visit cannot be confirmed.'
			);
		}
		if (b.startsAt && b.startsAt.getTime() <= now.getTime())
			throw new ValidationError('That time has already passed. Propose a new time instead.');
		b.state = 'confirmed';
		b.reason = null;
		return 'confirmed';
	});
}

/**
 * A new time, from either side, with a reason. From the workshop it is a proposal the fleet
 * accepts; from the fleet manager a new request the workshop confirms.
 */
export function rescheduleBooking(
	user: SessionUser,
	bookingId: number,
	input: { startsAt: string; reason: string },
	now = new Date()
) {
	return change(user, bookingId, now, async (b) => {
		const cap = await getCapacity(b.workshopId);
		const startsAt = fromLocal(input.startsAt, cap.timeZone);
		const { endsAt, day } = checkVisitTime(cap, b.visitKind as VisitKind, startsAt, now);
		await holdBay(cap, b.id, day);
		b.startsAt = startsAt;
		b.endsAt = endsAt;
		b.reason = input.reason.trim();
		b.state = user.role === 'workshop' ? 'proposed' : 'requested';
		return user.role === 'workshop' ? 'proposed' : 'rescheduled';
	});
}

/** The workshop turns a request down, with a reason; the bay is freed. */
export function declineBooking(
	user: SessionUser,
	bookingId: number,
	input: { reason: string },
	now = new Date()
) {
	if (user.role !== 'workshop')
		throw new ForbiddenError('Only the workshop declines a request; cancel it instead.');
	return change(user, bookingId, now, async (b) => {
		if (b.state === 'confirmed')
			throw new ValidationError('This visit is confirmed; cancel it with a reason instead.');
		await BookingSlot.destroy({ where: { bookingId: b.id } });
		b.state = 'declined';
		b.reason = input.reason.trim();
		return 'declined';
	});
}

/** Either side calls the visit off, with a reason; the bay is freed. */
export function cancelBooking(
	user: SessionUser,
	bookingId: number,
	input: { reason: string },
	now = new Date()
) {
	return change(user, bookingId, now, async (b) => {
		await BookingSlot.destroy({ where: { bookingId: b.id } });
		b.state = 'cancelled';
		b.reason = input.reason.trim();
		return 'cancelled';
	});
}

export interface WeekDay {
	day: string;
	open: boolean;
	closedNote: string | null;
	bays: number;
	bookings: BookingView[];
}

/** The workshop's week from `monday` (its local date): each day's bookings against its bays. */
export async function workshopWeek(
	user: SessionUser,
	monday: string
): Promise<{ capacity: Capacity; days: WeekDay[] }> {
	if (user.role !== 'workshop') throw new ForbiddenError();
	const cap = await getCapacity(user.organisationId);
	const first = fromLocal(`${monday}T00:00`, cap.timeZone);
	const end = fromLocal(
		`${isoDay(new Date(Date.parse(`${monday}T00:00:00Z`) + 7 * DAY_MS))}T00:00`,
		cap.timeZone
	);
	const bookings = (await listBookings(user, { from: first, to: end })).filter(
		(b) => (OPEN_BOOKING_STATES as readonly string[]).includes(b.state) || b.state === 'done'
	);
	const days: WeekDay[] = [];
	for (let i = 0; i < 7; i++) {
		const day = isoDay(new Date(Date.parse(`${monday}T00:00:00Z`) + i * DAY_MS));
		const closed = cap.closedDays.find((c) => c.day === day);
		const open = !cap.closedWeekdays.includes(i + 1) && !closed;
		days.push({
			day,
			open,
			closedNote: closed?.note ?? null,
			bays: open ? cap.baysPerDay : 0,
			bookings: bookings.filter((b) => b.startsAt && localDay(b.startsAt, cap.timeZone) === day)
		});
	}
	return { capacity: cap, days };
}

/** The first open day on or after `from` at opening time, as a wall-clock 'YYYY-MM-DDTHH:MM'. */
export function firstOpenStart(cap: Capacity, from: Date): string {
	for (let i = 0; i < 21; i++) {
		const day = isoDay(new Date(from.getTime() + i * DAY_MS));
		const weekday = new Date(`${day}T12:00:00Z`).getUTCDay() || 7;
		if (!cap.closedWeekdays.includes(weekday) && !cap.closedDays.some((c) => c.day === day))
			return `${day}T${cap.opensAt}`;
	}
	return `${isoDay(from)}T${cap.opensAt}`;
}

/** What the request form needs: the contracted workshops, the suggested window and a first time. */
export async function visitRequestForm(user: SessionUser, vehicleId: number, now = new Date()) {
	if (user.role !== 'fleet_manager') throw new ForbiddenError();
	const vehicle = await Vehicle.findOne({
		where: { id: vehicleId, organisationId: user.organisationId }
	});
	if (!vehicle) throw new NotFoundError('That van');
	const [workshops, window, open] = await Promise.all([
		bookableWorkshops(user.organisationId, now),
		suggestWindow(vehicleId, now),
		Booking.findOne({
			where: { vehicleId, state: { [Op.in]: [...OPEN_BOOKING_STATES] } },
			attributes: ['id']
		})
	]);
	return {
		vehicle: { id: vehicle.id, registration: vehicle.registration },
		workshops,
		window,
		openBookingId: open?.id ?? null,
		suggestedStart: workshops[0] ? firstOpenStart(workshops[0], window.from) : ''
	};
}

/** The Monday (local date) of the week holding `at` in `timeZone`. */
export function mondayOf(at: Date, timeZone: string): string {
	const day = localDay(at, timeZone);
	const weekday = new Date(`${day}T12:00:00Z`).getUTCDay() || 7;
	return isoDay(new Date(Date.parse(`${day}T00:00:00Z`) - (weekday - 1) * DAY_MS));
}

/** Requests and proposals waiting for an answer, oldest first. */
export async function waitingBookings(user: SessionUser): Promise<BookingView[]> {
	const all = await listBookings(user);
	return all.filter((b) =>
		user.role === 'workshop' ? b.state === 'requested' : b.state === 'proposed'
	);
}
