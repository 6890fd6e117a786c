import { requireRole } from '$lib/server/auth/guards';
import { loadImportList, undoAction, uploadAction } from '$lib/server/http/import-pages';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) =>
	loadImportList(requireRole('fleet_manager'), url);

export const actions: Actions = {
	upload: async ({ request }) => uploadAction(requireRole('fleet_manager'), request, '/fleet'),
	undo: async ({ request }) => undoAction(requireRole('fleet_manager'), request, '/fleet')
};
