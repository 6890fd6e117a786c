import { loadPasswordLink, setPasswordFromLink } from '$lib/server/http/password-link';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params }) => loadPasswordLink(params.token, 'invite');

export const actions: Actions = {
	default: (event) => setPasswordFromLink(event, 'invite')
};
