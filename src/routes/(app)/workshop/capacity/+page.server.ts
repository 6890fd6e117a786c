import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import { parseForm } from '$lib/server/http/forms';
import { orFormFailure } from '$lib/server/http/service-fail';
import {
	addClosedDay,
	capacitySettings,
	getClosedDay,
	removeClosedDay,
	saveHours,
	saveVisitKinds
} from '$lib/server/services/workshop-capacity';
import {
	capacityHoursSchema,
	closedDaySchema,
	removeClosedDaySchema,
	visitKindsSchema
} from '$lib/validation/capacity';
import { formId } from '$lib/validation/helpers';
import type { Actions, PageServerLoad } from './$types';

const NOTICES: Record<string, string> = {
	hours: 'Bays and opening hours are saved. New requests are checked against them from now on.',
	closed: 'The closed day is added; no visit can be booked on it.',
	reopened: 'The closed day is removed; visits can be booked on it again.',
	kinds: 'Visit kinds are saved. Visits already booked keep their times.'
};

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('workshop');
	const settings = await orHttpError(() => capacitySettings(user, new Date()));
	// ?remove=<id> asks before opening a closed day again (works without JavaScript).
	const asked = formId.safeParse(url.searchParams.get('remove'));
	const removing = asked.success ? await orHttpError(() => getClosedDay(user, asked.data)) : null;
	const notice = [...url.searchParams.keys()].map((k) => NOTICES[k]).find(Boolean) ?? null;
	return {
		settings,
		removing,
		notice,
		timeZones: Intl.supportedValuesOf('timeZone')
	};
};

const tagged = <T extends { data: unknown }>(action: string, failure: T) =>
	fail(400, { ...(failure.data as object), action });

export const actions: Actions = {
	hours: async ({ request }) => {
		const user = requireRole('workshop');
		const parsed = await parseForm(capacityHoursSchema, request);
		if (!parsed.ok) return tagged('hours', parsed.failure);
		const result = await orFormFailure(parsed.values, () =>
			saveHours(user, parsed.data, new Date())
		);
		if (!result.ok) return tagged('hours', result.failure);
		redirect(303, '/workshop/capacity?hours');
	},
	addClosedDay: async ({ request }) => {
		const user = requireRole('workshop');
		const parsed = await parseForm(closedDaySchema, request);
		if (!parsed.ok) return tagged('addClosedDay', parsed.failure);
		const result = await orFormFailure(parsed.values, () =>
			addClosedDay(user, parsed.data, new Date())
		);
		if (!result.ok) return tagged('addClosedDay', result.failure);
		redirect(303, '/workshop/capacity?closed');
	},
	removeClosedDay: async ({ request }) => {
		const user = requireRole('workshop');
		const parsed = await parseForm(removeClosedDaySchema, request);
		if (!parsed.ok) return tagged('removeClosedDay', parsed.failure);
		await orHttpError(() => removeClosedDay(user, parsed.data.closedDayId, new Date()));
		redirect(303, '/workshop/capacity?reopened');
	},
	kinds: async ({ request }) => {
		const user = requireRole('workshop');
		const parsed = await parseForm(visitKindsSchema, request);
		if (!parsed.ok) return tagged('kinds', parsed.failure);
		const result = await orFormFailure(parsed.values, () =>
			saveVisitKinds(user, parsed.data, new Date())
		);
		if (!result.ok) return tagged('kinds', result.failure);
		redirect(303, '/workshop/capacity?kinds');
	}
};
