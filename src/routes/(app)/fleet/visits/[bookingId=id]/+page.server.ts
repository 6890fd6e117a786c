import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import { parseForm } from '$lib/server/http/forms';
import { orFormFailure } from '$lib/server/http/service-fail';
import {
	cancelBooking,
	confirmBooking,
	getBooking,
	rescheduleBooking
} from '$lib/server/services/bookings';
import { getReportForBooking } from '$lib/server/services/visit-reports';
import { cancelSchema, declineSchema, rescheduleSchema } from '$lib/validation/visits';
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

export const load: PageServerLoad = async ({ params, url }) => {
	const user = requireRole('fleet_manager');
	const id = Number(params.bookingId);
	const booking = await orHttpError(() => getBooking(user, id));
	const notice = [...url.searchParams.keys()].map((k) => NOTICES[k]).find(Boolean) ?? null;
	return { booking, notice, report: await getReportForBooking(user, id) };
};

const back = (id: string, what: string) => redirect(303, `/fleet/visits/${id}?${what}`);
const tagged = <T extends { data: unknown }>(action: string, failure: T) =>
	fail(400, { ...(failure.data as object), action });

export const actions: Actions = {
	confirm: async ({ params }) => {
		const user = requireRole('fleet_manager');
		const result = await orFormFailure({}, () => confirmBooking(user, Number(params.bookingId)));
		if (!result.ok) return tagged('confirm', result.failure);
		back(params.bookingId, 'confirmed');
	},
	reschedule: async ({ params, request }) => {
		const user = requireRole('fleet_manager');
		const parsed = await parseForm(rescheduleSchema, request);
		if (!parsed.ok) return tagged('reschedule', parsed.failure);
		const result = await orFormFailure(parsed.values, () =>
			rescheduleBooking(user, Number(params.bookingId), parsed.data)
		);
		if (!result.ok) return tagged('reschedule', result.failure);
		back(params.bookingId, 'rescheduled');
	},

	cancel: async ({ params, request }) => {
		const user = requireRole('fleet_manager');
		const parsed = await parseForm(cancelSchema, request);
		if (!parsed.ok) return tagged('cancel', parsed.failure);
		const result = await orFormFailure(parsed.values, () =>
			cancelBooking(user, Number(params.bookingId), { reason: parsed.data.cancelReason })
		);
		if (!result.ok) return tagged('cancel', result.failure);
		back(params.bookingId, 'cancelled');
	}
};
