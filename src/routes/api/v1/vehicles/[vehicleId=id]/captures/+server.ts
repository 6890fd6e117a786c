import { json } from '@sveltejs/kit';
import { requireApiUser } from '$lib/server/auth/guards';
import { apiRespond, readQuery } from '$lib/server/http/api';
import { uploadStaticCapture } from '$lib/server/services/sensor-tests';
import { captureQuerySchema } from '$lib/validation/sensor-tests';
import type { RequestHandler } from './$types';

/** A voltage capture sent as the raw body (`Content-Type: text/csv`), streamed and analysed. */
export const POST: RequestHandler = ({ request, params, url }) =>
	apiRespond(async () => {
		const user = await requireApiUser('workshop');
		const query = readQuery(url, captureQuerySchema);
		const body = (request.body ?? []) as unknown as AsyncIterable<Uint8Array>;
		const test = await uploadStaticCapture(
			user,
			Number(params.vehicleId),
			{ fileName: query.fileName, body },
			query
		);
		return json(test, { status: 201 });
	});
