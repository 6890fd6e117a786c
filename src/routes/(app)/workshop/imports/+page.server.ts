import { requireRole } from '$lib/server/auth/guards';
import { loadImportList, undoAction, uploadAction } from '$lib/server/http/import-pages';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => loadImportList(requireRole('workshop'), url);

export const actions: Actions = {
	upload: async ({ request }) => uploadAction(requireRole('workshop'), request, '/workshop'),
	undo: async ({ request }) => undoAction(requireRole('workshop'), request, '/workshop')
};
