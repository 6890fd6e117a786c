import { Readable } from 'node:stream';
import { requireApiUser } from '$lib/server/auth/guards';
import { apiRespond } from '$lib/server/http/api';
import { openUploadForDownload } from '$lib/server/services/sensor-tests';
import type { RequestHandler } from './$types';

/** Downloads a stored file: the uploading organisation, or anyone who can see its van. */
export const GET: RequestHandler = ({ params }) =>
	apiRespond(async () => {
		const user = await requireApiUser('fleet_manager', 'workshop');
		const file = await openUploadForDownload(user, Number(params.uploadId));
		const body = Readable.toWeb(file.stream()) as unknown as ReadableStream<Uint8Array>;
		return new Response(body, {
			headers: {
				'content-type': file.contentType,
				'content-length': String(file.sizeBytes),
				'content-disposition': `attachment; filename="${file.name.replace(/["\\\r\n]/g, '_')}"`,
				'x-content-sha256': file.sha256
			}
		});
	});
