import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { orHttpError } from '$lib/server/http/errors';
import { parseForm } from '$lib/server/http/forms';
import {
	getSensorTest,
	rejudgeStaticTest,
	sensorTestTrace
} from '$lib/server/services/sensor-tests';
import { STATIC_PHASES, type PhaseBoundaries } from '$lib/domain/capture/phases';
import { phasesFormSchema } from '$lib/validation/sensor-tests';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('workshop');
	const test = await orHttpError(() => getSensorTest(user, Number(params.testId)));
	if (test.vehicle.id !== Number(params.vehicleId))
		redirect(307, `/workshop/vans/${test.vehicle.id}/tests/${test.id}`);
	const trace =
		test.kind === 'static'
			? await orHttpError(() => sensorTestTrace(user, test.id, { points: 800 }))
			: null;
	return { test, trace };
};

export const actions: Actions = {
	phases: async ({ request, params }) => {
		const user = requireRole('workshop');
		const parsed = await parseForm(phasesFormSchema, request);
		if (!parsed.ok) return parsed.failure;
		const phases: PhaseBoundaries = {};
		for (const p of STATIC_PHASES) {
			const startS = parsed.data[`${p}.startS`];
			const endS = parsed.data[`${p}.endS`];
			if (startS !== undefined && endS !== undefined) phases[p] = { startS, endS };
		}
		if (Object.keys(phases).length === 0)
			return fail(400, {
				values: parsed.values,
				errors: { form: 'Give at least one phase, or use the phases Sootcast found.' }
			});
		await orHttpError(() => rejudgeStaticTest(user, Number(params.testId), phases));
		redirect(303, `/workshop/vans/${params.vehicleId}/tests/${params.testId}?judged`);
	},
	detected: async ({ params }) => {
		const user = requireRole('workshop');
		await orHttpError(() => rejudgeStaticTest(user, Number(params.testId), null));
		redirect(303, `/workshop/vans/${params.vehicleId}/tests/${params.testId}?judged`);
	}
};
