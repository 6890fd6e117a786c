import { requireRole } from '$lib/server/auth/guards';
import { importAction, loadImportMapping, previewAction } from '$lib/server/http/import-pages';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, url }) =>
	loadImportMapping(requireRole('fleet_manager'), Number(params.uploadId), url);

export const actions: Actions = {
	preview: async ({ request, params }) =>
		previewAction(requireRole('fleet_manager'), Number(params.uploadId), request),
	import: async ({ request, params }) =>
		importAction(requireRole('fleet_manager'), Number(params.uploadId), request, '/fleet')
};
