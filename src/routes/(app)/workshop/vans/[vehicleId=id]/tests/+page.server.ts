import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { fieldErrors } from '$lib/server/http/forms';
import { orHttpError } from '$lib/server/http/errors';
import { readMultipart } from '$lib/server/http/multipart';
import { PayloadTooLargeError, ValidationError } from '$lib/server/services/errors';
import {
	listSensorTests,
	recordVacuumCheck,
	sensorTypeChoices,
	uploadStaticCapture
} from '$lib/server/services/sensor-tests';
import { getVehicleStory } from '$lib/server/services/vehicles';
import {
	captureOptionsSchema,
	vacuumCheckSchema,
	vacuumFromForm
} from '$lib/validation/sensor-tests';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole('workshop');
	const vehicleId = Number(params.vehicleId);
	const [story, tests, sensorTypes] = await orHttpError(() =>
		Promise.all([
			getVehicleStory(user, vehicleId),
			listSensorTests(user, vehicleId),
			sensorTypeChoices()
		])
	);
	return {
		vehicle: {
			id: story.vehicle.id,
			registration: story.vehicle.registration,
			sensorTypeId: story.vehicle.sensorTypeId
		},
		tests,
		sensorTypes
	};
};

export const actions: Actions = {
	capture: async ({ request, params }) => {
		const user = requireRole('workshop');
		const vehicleId = Number(params.vehicleId);
		let created;
		let fields: Record<string, string> = {};
		try {
			// The form puts its options before the file, so they have arrived when the file starts
			const read = await readMultipart(request, async (file, before) => {
				const options = captureOptionsSchema.safeParse(before);
				return uploadStaticCapture(user, vehicleId, file, options.success ? options.data : {});
			});
			fields = read.fields;
			created = read.result;
		} catch (err) {
			if (err instanceof ValidationError || err instanceof PayloadTooLargeError) {
				return fail(err instanceof PayloadTooLargeError ? 413 : 400, {
					form: 'capture',
					values: fields,
					errors: { file: err.message }
				});
			}
			throw err;
		}
		if (!created)
			return fail(400, {
				form: 'capture',
				values: fields,
				errors: { file: 'Choose a capture file (CSV of time and volts)' }
			});
		redirect(303, `/workshop/vans/${vehicleId}/tests/${created.testId}`);
	},
	vacuum: async ({ request, params }) => {
		const user = requireRole('workshop');
		const raw: Record<string, string> = {};
		for (const [k, v] of (await request.formData()).entries())
			if (typeof v === 'string') raw[k] = v;
		const { input, errors } = vacuumFromForm(raw);
		const parsed = vacuumCheckSchema.safeParse(input);
		if (Object.keys(errors).length || !parsed.success) {
			return fail(400, {
				form: 'vacuum',
				values: raw,
				errors: { ...errors, ...(parsed.success ? {} : fieldErrors(parsed.error)) }
			});
		}
		const created = await orHttpError(() =>
			recordVacuumCheck(user, Number(params.vehicleId), parsed.data)
		);
		redirect(303, `/workshop/vans/${params.vehicleId}/tests/${created.testId}`);
	}
};
