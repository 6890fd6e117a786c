import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import { readAttachmentForm } from '$lib/server/http/attachment-form';
import { parseFields, parseForm } from '$lib/server/http/forms';
import { orFormFailure } from '$lib/server/http/service-fail';
import {
	cancelBooking,
	confirmBooking,
	declineBooking,
	getBooking,
	rescheduleBooking
} from '$lib/server/services/bookings';
import {
	createVisitReport,
	getReportForBooking,
	reportFormTests
} from '$lib/server/services/visit-reports';
import { fromLocal } from '$lib/server/services/bookings';
import { discardStored } from '$lib/server/services/visit-report-attachments';
import {
	cancelSchema,
	declineSchema,
	rescheduleSchema,
	visitReportSchema
} from '$lib/validation/visits';
import type { Actions, PageServerLoad } from './$types';

const NOTICES: Record<string, string> = {
	requested: 'Your request is sent; the workshop has been e-mailed a calendar invitation.',
	confirmed: 'The visit is confirmed; both sides have been e-mailed an updated invitation.',
	rescheduled: 'The new time is sent; both sides have been e-mailed an updated invitation.',
	declined: 'The request is declined; both sides have been e-mailed.',
	cancelled: 'The visit is cancelled; both sides have been e-mailed a cancellation.',
	reported:
		'The visit report is saved, the van’s forecast is updated and the report is e-mailed to the fleet.'
};

/** A refused report form; the browser has emptied its file input, so the page asks for the files again. */
const reportFailure = <T extends { status: number; data: object }>(failure: T, hadFiles: boolean) =>
	fail(failure.status, { ...failure.data, action: 'report', filesNotKept: hadFiles });

export const load: PageServerLoad = async ({ params, url }) => {
	const user = requireRole('workshop');
	const id = Number(params.bookingId);
	const booking = await orHttpError(() => getBooking(user, id));
	const notice = [...url.searchParams.keys()].map((k) => NOTICES[k]).find(Boolean) ?? null;
	return {
		booking,
		notice,
		report: await getReportForBooking(user, id),
		tests: await reportFormTests(booking.vehicleId)
	};
};

const back = (id: string, what: string) => redirect(303, `/workshop/visits/${id}?${what}`);
const tagged = <T extends { data: unknown }>(action: string, failure: T) =>
	fail(400, { ...(failure.data as object), action });

export const actions: Actions = {
	confirm: async ({ params }) => {
		const user = requireRole('workshop');
		const result = await orFormFailure({}, () => confirmBooking(user, Number(params.bookingId)));
		if (!result.ok) return tagged('confirm', result.failure);
		back(params.bookingId, 'confirmed');
	},
	reschedule: async ({ params, request }) => {
		const user = requireRole('workshop');
		const parsed = await parseForm(rescheduleSchema, request);
		if (!parsed.ok) return tagged('reschedule', parsed.failure);
		const result = await orFormFailure(parsed.values, () =>
			rescheduleBooking(user, Number(params.bookingId), parsed.data)
		);
		if (!result.ok) return tagged('reschedule', result.failure);
		back(params.bookingId, 'rescheduled');
	},
	decline: async ({ params, request }) => {
		const user = requireRole('workshop');
		const parsed = await parseForm(declineSchema, request);
		if (!parsed.ok) return tagged('decline', parsed.failure);
		const result = await orFormFailure(parsed.values, () =>
			declineBooking(user, Number(params.bookingId), { reason: parsed.data.declineReason })
		);
		if (!result.ok) return tagged('decline', result.failure);
		back(params.bookingId, 'declined');
	},
	report: async ({ params, request }) => {
		const user = requireRole('workshop');
		// Before the body is read, so no file is stored for a visit this workshop cannot see
		const booking = await orHttpError(() => getBooking(user, Number(params.bookingId)));
		const upload = await readAttachmentForm(user, request);
		if (!upload.ok) return reportFailure(upload.failure, true);
		const parsed = parseFields(visitReportSchema, upload.fields);
		if (!parsed.ok) {
			await discardStored(upload.files);
			return reportFailure(parsed.failure, upload.files.length > 0);
		}
		const { usage, fuel, oilGrade, serviceHistory, engineFaults, visitedAt, ...rest } = parsed.data;
		// The service attaches the files with the report, or removes them if it refuses
		const result = await orFormFailure(parsed.values, () =>
			createVisitReport(
				user,
				booking.id,
				{
					...rest,
					visitedAt: fromLocal(visitedAt, booking.timeZone),
					rootCause: { usage, fuel, oilGrade, serviceHistory, engineFaults }
				},
				new Date(),
				upload.files
			)
		);
		if (!result.ok) return reportFailure(result.failure, upload.files.length > 0);
		back(params.bookingId, 'reported');
	},
	cancel: async ({ params, request }) => {
		const user = requireRole('workshop');
		const parsed = await parseForm(cancelSchema, request);
		if (!parsed.ok) return tagged('cancel', parsed.failure);
		const result = await orFormFailure(parsed.values, () =>
			cancelBooking(user, Number(params.bookingId), { reason: parsed.data.cancelReason })
		);
		if (!result.ok) return tagged('cancel', result.failure);
		back(params.bookingId, 'cancelled');
	}
};
