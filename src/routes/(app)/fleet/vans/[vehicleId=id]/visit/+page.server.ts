import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import { parseForm } from '$lib/server/http/forms';
import { orFormFailure } from '$lib/server/http/service-fail';
import { requestVisit, visitRequestForm } from '$lib/server/services/bookings';
import { visitRequestSchema } from '$lib/validation/visits';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('fleet_manager');
	return { form: await orHttpError(() => visitRequestForm(user, Number(params.vehicleId))) };
};

export const actions: Actions = {
	request: async ({ params, request }) => {
		const user = requireRole('fleet_manager');
		const parsed = await parseForm(visitRequestSchema, request);
		if (!parsed.ok) return parsed.failure;
		const result = await orFormFailure(parsed.values, () =>
			requestVisit(user, { ...parsed.data, vehicleId: Number(params.vehicleId) })
		);
		if (!result.ok) return result.failure;
		redirect(303, `/fleet/visits/${result.value.id}?requested`);
	}
};
