import { Readable } from 'node:stream';
import { requireApiUser } from '$lib/server/auth/guards';
import { apiRespond } from '$lib/server/http/api';
import { openAttachment } from '$lib/server/services/visit-report-attachments';
import type { RequestHandler } from './$types';

/**
 * A report's photo or PDF, for its van's fleet and the workshop that wrote it (404 for anyone
 * else). Served inline with the type found by sniffing, so thumbnails use the same address.
 */
export const GET: RequestHandler = ({ params, request }) =>
	apiRespond(async () => {
		const user = await requireApiUser('fleet_manager', 'workshop');
		const file = await openAttachment(user, Number(params.reportId), Number(params.attachmentId));
		const etag = `"${file.sha256}"`;
		const headers = {
			etag,
			// Revalidate each time: a removed file must not linger in a shared browser's cache
			'cache-control': 'private, no-cache',
			'x-content-type-options': 'nosniff'
		};
		if (request.headers.get('if-none-match') === etag)
			return new Response(null, { status: 304, headers });
		const ascii = file.fileName.replace(/[^\x20-\x7e]|["\\]/g, '_');
		return new Response(Readable.toWeb(file.stream()) as unknown as ReadableStream<Uint8Array>, {
			headers: {
				...headers,
				'content-type': file.mediaType,
				'content-length': String(file.sizeBytes),
				// RFC 6266 with an RFC 8187 UTF-8 name for non-ASCII file names
				'content-disposition': `inline; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(file.fileName)}`
			}
		});
	});
