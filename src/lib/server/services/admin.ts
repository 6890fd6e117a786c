import { Contract, Organisation, User } from '../db';
import type { SessionUser } from '../auth/lucia';
import { ForbiddenError } from './errors';

/** Organisations with their people and contracts, for the administrator's overview. */
export async function getAdminOverview(user: SessionUser) {
	if (user.role !== 'admin') throw new ForbiddenError();
	const [organisations, users, contracts] = await Promise.all([
		Organisation.findAll({ order: [['kind', 'ASC'], ['name', 'ASC']] }),
		User.findAll({ attributes: ['id', 'name', 'email', 'role', 'organisationId', 'active'], order: [['name', 'ASC']] }),
		Contract.findAll({ order: [['startsOn', 'ASC']] })
	]);
	const orgName = new Map(organisations.map((o) => [o.id, o.name]));
	return {
		organisations: organisations.map((o) => ({
			id: o.id,
			name: o.name,
			kind: o.kind,
			people: users.filter((u) => u.organisationId === o.id).length
		})),
		users: users.map((u) => ({ id: u.id, name: u.name, email: u.email, role: u.role, organisation: orgName.get(u.organisationId) ?? '—', active: u.active })),
		contracts: contracts.map((c) => ({
			id: c.id,
			fleet: orgName.get(c.fleetId) ?? '—',
			workshop: orgName.get(c.workshopId) ?? '—',
			startsOn: c.startsOn,
			endsOn: c.endsOn ?? null
		}))
	};
}
