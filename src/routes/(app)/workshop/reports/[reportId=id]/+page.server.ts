import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { readAttachmentForm } from '$lib/server/http/attachment-form';
import { orHttpError } from '$lib/server/http/errors';
import { parseForm } from '$lib/server/http/forms';
import { orFormFailure } from '$lib/server/http/service-fail';
import { attachToReport, removeAttachment } from '$lib/server/services/visit-report-attachments';
import { getVisitReport } from '$lib/server/services/visit-reports';
import { removeAttachmentSchema } from '$lib/validation/visits';
import type { Actions, PageServerLoad } from './$types';

const NOTICES: Record<string, string> = {
	attached: 'The files are attached to the report.',
	removed: 'The file is removed from the report.'
};

export const load: PageServerLoad = async ({ params, url }) => {
	const user = requireRole('workshop');
	const report = await orHttpError(() => getVisitReport(user, Number(params.reportId)));
	return {
		report,
		// Only the workshop that wrote the report adds or removes its files
		canEditFiles: report.workshopId === user.organisationId,
		notice: [...url.searchParams.keys()].map((k) => NOTICES[k]).find(Boolean) ?? null
	};
};

export const actions: Actions = {
	attach: async ({ params, request }) => {
		const user = requireRole('workshop');
		const reportId = Number(params.reportId);
		// Before the body is read, so nothing is stored for a report out of reach
		await orHttpError(() => getVisitReport(user, reportId));
		const upload = await readAttachmentForm(user, request);
		if (!upload.ok)
			return fail(upload.failure.status, { ...upload.failure.data, action: 'attach' });
		const result = await orFormFailure({}, () => attachToReport(user, reportId, upload.files));
		if (!result.ok) return fail(400, { ...result.failure.data, action: 'attach' });
		redirect(303, `/workshop/reports/${reportId}?attached`);
	},
	remove: async ({ params, request }) => {
		const user = requireRole('workshop');
		const parsed = await parseForm(removeAttachmentSchema, request);
		if (!parsed.ok) return fail(400, { ...parsed.failure.data, action: 'remove' });
		await orHttpError(() =>
			removeAttachment(user, Number(params.reportId), parsed.data.attachmentId)
		);
		redirect(303, `/workshop/reports/${params.reportId}?removed`);
	}
};
