import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guards';
import { parseForm } from '$lib/server/http/forms';
import {
	changePerson,
	createContract,
	createOrganisation,
	endContract,
	getAdminOverview
} from '$lib/server/services/admin';
import { ValidationError } from '$lib/server/services/errors';
import { orHttpError } from '$lib/server/http/errors';
import {
	changePersonSchema,
	endContractSchema,
	newContractSchema,
	newOrganisationSchema
} from '$lib/validation/admin';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('admin');
	return { overview: await getAdminOverview(user), done: url.searchParams.get('done') };
};

/** Runs one admin change; a correctable problem comes back to the form that caused it. */
async function attempt(formName: string, work: () => Promise<unknown>, done: string) {
	try {
		await orHttpError(work);
	} catch (err) {
		if (err instanceof ValidationError)
			return fail(400, { form: formName, errors: err.fields, message: err.message });
		throw err;
	}
	redirect(303, `/admin?done=${encodeURIComponent(done)}`);
}

export const actions: Actions = {
	createOrganisation: async ({ request }) => {
		const user = requireRole('admin');
		const parsed = await parseForm(newOrganisationSchema, request);
		if (!parsed.ok) return fail(400, { form: 'createOrganisation', ...parsed.failure.data });
		return attempt(
			'createOrganisation',
			() => createOrganisation(user, parsed.data),
			`${parsed.data.name} added.`
		);
	},
	createContract: async ({ request }) => {
		const user = requireRole('admin');
		const parsed = await parseForm(newContractSchema, request);
		if (!parsed.ok) return fail(400, { form: 'createContract', ...parsed.failure.data });
		return attempt('createContract', () => createContract(user, parsed.data), 'Contract added.');
	},
	endContract: async ({ request }) => {
		const user = requireRole('admin');
		const parsed = await parseForm(endContractSchema, request);
		if (!parsed.ok) return fail(400, { form: 'endContract', ...parsed.failure.data });
		return attempt('endContract', () => endContract(user, parsed.data), 'Contract end date saved.');
	},
	changePerson: async ({ request }) => {
		const user = requireRole('admin');
		const parsed = await parseForm(changePersonSchema, request);
		if (!parsed.ok) return fail(400, { form: 'changePerson', ...parsed.failure.data });
		return attempt('changePerson', () => changePerson(user, parsed.data), 'Saved.');
	}
};
