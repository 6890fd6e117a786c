import { Op } from 'sequelize';
import {
	getDb,
	Booking,
	BookingChange,
	Organisation,
	Reading,
	SensorTest,
	User,
	Vehicle,
	VehicleEvent,
	VisitReport,
	VisitReportAttachment,
	together
} from '../db';
import type { SessionUser } from '../auth/lucia';
import { publicUrl } from '../config';
import { buttonHtml, escapeHtml, frameHtml } from '../mail/html';
import { showDateTime } from '../../format';
import { VISIT_KIND_LABEL, type VisitKind } from '../../domain/visits';
import type { EventKind } from '../../domain/vocabulary';
import { VISIT_CAUTIONS } from '../../visit-cautions';
import { ForbiddenError, NotFoundError, ValidationError } from './errors';
import { recordAudit } from './audit';
import { forecastVehicle } from './forecasts';
import { kickOutbox, queueMail } from './outbox';
import { vehicleScope } from './scope';
import { listBookings } from './bookings';
import {
	discardStored,
	insertAttachments,
	listAttachments,
	mayOpenAttachments,
	type AttachmentView,
	type StoredAttachment
} from './visit-report-attachments';

/** What a workshop can record as done; each becomes a vehicle event the forecast reads. */
export const VISIT_ACTIONS = [
	'regen_service',
	'filter_cleaning',
	'filter_replacement',
	'sensor_repair',
	'pipe_repair'
] as const;
export type VisitAction = (typeof VISIT_ACTIONS)[number];
export const VISIT_ACTION_LABEL: Record<VisitAction, string> = {
	regen_service: 'Service regeneration',
	filter_cleaning: 'Off-vehicle filter cleaning',
	filter_replacement: 'Filter replacement',
	sensor_repair: 'Δp sensor repaired or replaced',
	pipe_repair: 'Sensor pipe repaired or replaced'
};
/** Pipe repairs are sensor-line repairs to the engine: both restart the comparable series. */
const EVENT_OF: Record<VisitAction, EventKind> = {
	regen_service: 'regen_service',
	filter_cleaning: 'filter_cleaning',
	filter_replacement: 'filter_replacement',
	sensor_repair: 'sensor_repair',
	pipe_repair: 'sensor_repair'
};

export const ROOT_CAUSE_FIELDS = [
	'usage',
	'fuel',
	'oilGrade',
	'serviceHistory',
	'engineFaults'
] as const;
export const ROOT_CAUSE_LABEL: Record<(typeof ROOT_CAUSE_FIELDS)[number], string> = {
	usage: 'Usage profile (trips, idling, stop-start)',
	fuel: 'Fuel',
	oilGrade: 'Engine oil grade and specification',
	serviceHistory: 'Service history',
	engineFaults: 'Engine faults found (injectors, EGR, boost, turbo, thermostat)'
};

export interface VisitReportInput {
	visitedAt: Date;
	findings: string;
	actions: VisitAction[];
	idleBeforeMbar?: number;
	idleAfterMbar?: number;
	odometerKm?: number;
	sensorTestId?: number;
	rootCause: Partial<Record<(typeof ROOT_CAUSE_FIELDS)[number], string>>;
	signOff: boolean;
}

export interface VisitReportView {
	id: number;
	bookingId: number | null;
	vehicleId: number;
	registration: string;
	workshopId: number;
	workshopName: string;
	author: string;
	visitedAt: Date;
	findings: string | null;
	actions: { action: VisitAction; label: string }[];
	readings: { label: string; mbar: number }[];
	sensorTest: { id: number; kind: string; verdict: string; testedAt: Date } | null;
	rootCause: { label: string; text: string }[];
	signedOffAt: Date | null;
	signedOffBy: string | null;
	visitKindLabel: string | null;
	/** Empty for a workshop that did not write the report: its files are not theirs to open. */
	attachments: AttachmentView[];
}

/**
 * The workshop records a confirmed visit: readings join the van's series (idle, source
 * 'visit'), each action becomes a vehicle event (cleaning and replacement start a new epoch
 * in the forecast), the booking is done. Then the van is forecast again and the fleet's
 * managers are e-mailed the report. Files already streamed to storage are attached in the same
 * transaction, and removed again if the report is refused.
 */
export async function createVisitReport(
	user: SessionUser,
	bookingId: number,
	input: VisitReportInput,
	now = new Date(),
	files: StoredAttachment[] = []
): Promise<VisitReportView> {
	let reportId: number;
	try {
		reportId = await saveReport(user, bookingId, input, now, files);
	} catch (err) {
		await discardStored(files);
		throw err;
	}
	const report = await VisitReport.findByPk(reportId);
	await forecastVehicle(report!.vehicleId, now);
	await mailReport(reportId, now);
	return viewOf(report!, await listAttachments(reportId));
}

async function saveReport(
	user: SessionUser,
	bookingId: number,
	input: VisitReportInput,
	now: Date,
	files: StoredAttachment[]
): Promise<number> {
	if (user.role !== 'workshop')
		throw new ForbiddenError('Only the workshop writes the visit report.');
	return getDb().transaction(async () => {
		const booking = await Booking.findOne({
			where: { id: bookingId, workshopId: user.organisationId }
		});
		if (!booking) throw new NotFoundError('That visit');
		const vehicle = await Vehicle.findOne({
			where: { [Op.and]: [await vehicleScope(user, now), { id: booking.vehicleId }] }
		});
		if (!vehicle) throw new NotFoundError('That visit');
		if (booking.state === 'done') throw new ValidationError('This visit already has its report.');
		if (booking.state !== 'confirmed')
			throw new ValidationError(
				'Only a confirmed visit can be reported. Confirm it first, or request a new one.'
			);
		if (input.visitedAt.getTime() > now.getTime()) {
			throw new ValidationError('The visit time cannot be in the future.', {
				visitedAt: 'The visit time cannot be in the future.'
			});
		}
		if (input.sensorTestId) {
			const test = await SensorTest.findOne({
				where: { id: input.sensorTestId, vehicleId: vehicle.id }
			});
			if (!test)
				throw new ValidationError('Choose one of this van’s tests.', {
					sensorTestId: 'Choose one of this van’s tests.'
				});
		}
		const report = await VisitReport.create({
			vehicleId: vehicle.id,
			workshopId: user.organisationId,
			bookingId: booking.id,
			authorId: user.id,
			visitedAt: input.visitedAt,
			findings: input.findings,
			rootCause: { ...input.rootCause },
			actions: {
				done: input.actions,
				sensorTestId: input.sensorTestId ?? null,
				idleBeforeMbar: input.idleBeforeMbar ?? null,
				idleAfterMbar: input.idleAfterMbar ?? null
			},
			signedOffAt: input.signOff ? now : null,
			signedOffById: input.signOff ? user.id : null
		});
		await insertAttachments(report.id, files, user, now);
		// Before-readings a minute before the visit time, the events at it, after-readings a minute later.
		const at = input.visitedAt.getTime();
		if (input.idleBeforeMbar !== undefined) {
			await Reading.create({
				vehicleId: vehicle.id,
				takenAt: new Date(at - 60_000),
				deltaPMbar: input.idleBeforeMbar,
				condition: 'idle',
				source: 'visit',
				authorId: user.id,
				odometerKm: input.odometerKm ?? null
			});
		}
		for (const action of input.actions) {
			await VehicleEvent.create({
				vehicleId: vehicle.id,
				occurredAt: input.visitedAt,
				kind: EVENT_OF[action],
				source: 'visit',
				authorId: user.id,
				visitReportId: report.id,
				odometerKm: input.odometerKm ?? null,
				notes: VISIT_ACTION_LABEL[action]
			});
		}
		if (input.idleAfterMbar !== undefined) {
			await Reading.create({
				vehicleId: vehicle.id,
				takenAt: new Date(at + 60_000),
				deltaPMbar: input.idleAfterMbar,
				condition: 'idle',
				source: 'visit',
				authorId: user.id,
				odometerKm: input.odometerKm ?? null
			});
		}
		const fromState = booking.state;
		booking.state = 'done';
		booking.sequence += 1;
		await booking.save();
		await BookingChange.create({
			bookingId: booking.id,
			userId: user.id,
			at: now,
			action: 'done',
			fromState,
			toState: 'done',
			startsAt: booking.startsAt,
			endsAt: booking.endsAt,
			sequence: booking.sequence,
			reason: null
		});
		await recordAudit(
			user,
			'visit_report.create',
			'visit_report',
			report.id,
			{ bookingId: booking.id, actions: input.actions, attachments: files.length },
			now
		);
		return report.id;
	});
}

async function viewOf(r: VisitReport, attachments: AttachmentView[]): Promise<VisitReportView> {
	const actionsJson = (r.actions ?? {}) as {
		done?: VisitAction[];
		sensorTestId?: number | null;
		idleBeforeMbar?: number | null;
		idleAfterMbar?: number | null;
	};
	const [vehicle, workshop, author, signer, test, booking] = await together(
		() => Vehicle.findByPk(r.vehicleId, { attributes: ['registration'] }),
		() => Organisation.findByPk(r.workshopId, { attributes: ['name'] }),
		() => User.findByPk(r.authorId, { attributes: ['name'] }),
		() => (r.signedOffById ? User.findByPk(r.signedOffById, { attributes: ['name'] }) : null),
		() => (actionsJson.sensorTestId ? SensorTest.findByPk(actionsJson.sensorTestId) : null),
		() => (r.bookingId ? Booking.findByPk(r.bookingId, { attributes: ['visitKind'] }) : null)
	);
	const rootCause = (r.rootCause ?? {}) as Record<string, string>;
	return {
		id: r.id,
		bookingId: r.bookingId,
		vehicleId: r.vehicleId,
		registration: vehicle?.registration ?? '',
		workshopId: r.workshopId,
		workshopName: workshop?.name ?? '',
		author: author?.name ?? '',
		visitedAt: r.visitedAt,
		findings: r.findings,
		actions: (actionsJson.done ?? []).map((action) => ({
			action,
			label: VISIT_ACTION_LABEL[action] ?? action
		})),
		readings: [
			...(actionsJson.idleBeforeMbar != null
				? [{ label: 'Δp at idle before the work', mbar: actionsJson.idleBeforeMbar }]
				: []),
			...(actionsJson.idleAfterMbar != null
				? [{ label: 'Δp at idle after the work', mbar: actionsJson.idleAfterMbar }]
				: [])
		],
		sensorTest: test
			? { id: test.id, kind: test.kind, verdict: test.verdict, testedAt: test.testedAt }
			: null,
		rootCause: ROOT_CAUSE_FIELDS.filter((k) => rootCause[k]).map((k) => ({
			label: ROOT_CAUSE_LABEL[k],
			text: rootCause[k]
		})),
		signedOffAt: r.signedOffAt,
		signedOffBy: signer?.name ?? null,
		visitKindLabel: booking
			? (VISIT_KIND_LABEL[booking.visitKind as VisitKind] ?? booking.visitKind)
			: null,
		attachments
	};
}

/** A report this person may see: of a van in their scope (fleet: own vans; workshop: contracted fleets). */
export async function getVisitReport(
	user: SessionUser,
	reportId: number
): Promise<VisitReportView> {
	const r = await VisitReport.findByPk(reportId);
	if (!r) throw new NotFoundError('That visit report');
	const visible = await Vehicle.count({
		where: { [Op.and]: [await vehicleScope(user), { id: r.vehicleId }] }
	});
	if (!visible) throw new NotFoundError('That visit report');
	return viewOf(r, mayOpenAttachments(user, r) ? await listAttachments(r.id) : []);
}

export async function getReportForBooking(
	user: SessionUser,
	bookingId: number
): Promise<VisitReportView | null> {
	const r = await VisitReport.findOne({ where: { bookingId }, order: [['id', 'DESC']] });
	return r ? getVisitReport(user, r.id) : null;
}

/** The van's sensor tests to attach to a report (newest first). */
export async function reportFormTests(vehicleId: number) {
	const tests = await SensorTest.findAll({
		where: { vehicleId },
		order: [['testedAt', 'DESC']],
		limit: 20,
		attributes: ['id', 'kind', 'verdict', 'testedAt']
	});
	return tests.map((t) => ({ id: t.id, kind: t.kind, verdict: t.verdict, testedAt: t.testedAt }));
}

async function mailReport(reportId: number, now: Date): Promise<void> {
	const r = await VisitReport.findByPk(reportId);
	if (!r) return;
	const view = await viewOf(r, []);
	const fileCount = await VisitReportAttachment.count({ where: { visitReportId: r.id } });
	const vehicle = await Vehicle.findByPk(r.vehicleId);
	const managers = await User.findAll({
		where: { organisationId: vehicle!.organisationId, role: 'fleet_manager', active: true },
		order: [['id', 'ASC']]
	});
	const subject = `Visit report for ${view.registration} from ${view.workshopName}`;
	for (const person of managers) {
		const link = `${publicUrl()}/fleet/reports/${r.id}`;
		const lines = [
			`${view.workshopName} visited ${view.registration} on ${showDateTime(view.visitedAt, person.locale, person.timeZone)}.`,
			'',
			`Done: ${view.actions.map((a) => a.label).join(', ') || 'no work recorded'}.`,
			...view.readings.map((x) => `${x.label}: ${x.mbar} mbar`),
			view.findings ? `Findings: ${view.findings}` : '',
			...view.rootCause.map((c) => `${c.label}: ${c.text}`),
			view.signedOffBy ? `Signed off by ${view.signedOffBy}.` : 'Not signed off yet.',
			// Files stay behind the sign-in: big photos do not belong in a mailbox
			fileCount
				? `${fileCount === 1 ? '1 photo or document is attached to the report; open it' : `${fileCount} photos or documents are attached to the report; open them`} there: ${link}`
				: '',
			'',
			`Read and print the report: ${link}`
		].filter((l, i, all) => l !== '' || all[i - 1] !== '');
		await queueMail(
			{
				recipient: person.email,
				subject,
				text: lines.join('\n'),
				html: frameHtml(
					subject,
					lines
						.filter(Boolean)
						.slice(0, -1)
						.map((l) => `<p>${escapeHtml(l)}</p>`)
						.join('') +
						buttonHtml(link, 'Read the report') +
						`<p style="font-size:14px">${escapeHtml(`Safety: ${VISIT_CAUTIONS}`)}</p>`
				),
				dedupeKey: `visit-report:${r.id}:${person.id}`
			},
			now
		);
	}
	kickOutbox();
}

/** A van's bookings and the reports written for them, for the van's page. */
export async function listVanVisits(user: SessionUser, vehicleId: number) {
	const visible = await Vehicle.count({
		where: { [Op.and]: [await vehicleScope(user), { id: vehicleId }] }
	});
	if (!visible) throw new NotFoundError('That van');
	const [bookings, reports] = await Promise.all([
		listBookings(user, { vehicleId }),
		VisitReport.findAll({
			where: { vehicleId },
			attributes: ['id', 'bookingId', 'workshopId'],
			order: [['id', 'ASC']]
		})
	]);
	const counts = await Promise.all(
		reports.map((r) =>
			mayOpenAttachments(user, r)
				? VisitReportAttachment.count({ where: { visitReportId: r.id } })
				: 0
		)
	);
	return {
		bookings,
		reports: reports.map((r, i) => ({ id: r.id, bookingId: r.bookingId, files: counts[i] }))
	};
}
