import { Contract, Organisation, Session, User } from '../db';
import type { SessionUser } from '../auth/lucia';
import { ForbiddenError, NotFoundError, ValidationError } from './errors';
import { recordAudit } from './audit';
import type {
	ChangePersonInput,
	EndContractInput,
	NewContractInput,
	NewOrganisationInput
} from '../../validation/admin';

/** Organisations with their people and contracts, for the administrator's overview. */
export async function getAdminOverview(user: SessionUser) {
	if (user.role !== 'admin') throw new ForbiddenError();
	const [organisations, users, contracts] = await Promise.all([
		Organisation.findAll({
			order: [
				['kind', 'ASC'],
				['name', 'ASC']
			]
		}),
		User.findAll({
			attributes: ['id', 'name', 'email', 'role', 'organisationId', 'active'],
			order: [['name', 'ASC']]
		}),
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
		users: users.map((u) => ({
			id: u.id,
			name: u.name,
			email: u.email,
			role: u.role,
			organisation: orgName.get(u.organisationId) ?? '—',
			active: u.active
		})),
		contracts: contracts.map((c) => ({
			id: c.id,
			fleet: orgName.get(c.fleetId) ?? '—',
			workshop: orgName.get(c.workshopId) ?? '—',
			startsOn: c.startsOn,
			endsOn: c.endsOn ?? null
		}))
	};
}

const ROLES_FOR_KIND: Record<string, string[]> = {
	fleet: ['fleet_manager', 'driver'],
	workshop: ['workshop'],
	platform: ['admin']
};

export async function createOrganisation(user: SessionUser, input: NewOrganisationInput) {
	if (user.role !== 'admin') throw new ForbiddenError();
	if (await Organisation.findOne({ where: { name: input.name } })) {
		throw new ValidationError('An organisation with that name exists already.', {
			name: 'An organisation with that name exists already'
		});
	}
	const org = await Organisation.create({ name: input.name, kind: input.kind });
	await recordAudit(user, 'organisation.create', 'organisation', org.id, input);
	return org.id;
}

export async function createContract(user: SessionUser, input: NewContractInput) {
	if (user.role !== 'admin') throw new ForbiddenError();
	const [fleet, workshop] = await Promise.all([
		Organisation.findByPk(input.fleetId),
		Organisation.findByPk(input.workshopId)
	]);
	if (fleet?.kind !== 'fleet')
		throw new ValidationError('Choose a fleet.', { fleetId: 'Choose a fleet' });
	if (workshop?.kind !== 'workshop')
		throw new ValidationError('Choose a workshop.', { workshopId: 'Choose a workshop' });
	const contract = await Contract.create({
		fleetId: fleet.id,
		workshopId: workshop.id,
		startsOn: input.startsOn,
		endsOn: input.endsOn ?? null
	});
	await recordAudit(user, 'contract.create', 'contract', contract.id, input);
	return contract.id;
}

/** Ends a contract on a given day: from the day after, the workshop no longer sees the fleet. */
export async function endContract(user: SessionUser, input: EndContractInput) {
	if (user.role !== 'admin') throw new ForbiddenError();
	const contract = await Contract.findByPk(input.contractId);
	if (!contract) throw new NotFoundError('That contract');
	if (input.endsOn < contract.startsOn)
		throw new ValidationError('The last day cannot be before the first.', {
			endsOn: 'The last day cannot be before the first'
		});
	await contract.update({ endsOn: input.endsOn });
	await recordAudit(user, 'contract.end', 'contract', contract.id, input);
}

/** Changes a person's role (within what their organisation allows) or switches them off. */
export async function changePerson(user: SessionUser, input: ChangePersonInput) {
	if (user.role !== 'admin') throw new ForbiddenError();
	const person = await User.findByPk(input.userId);
	if (!person) throw new NotFoundError('That person');
	if (person.id === user.id && (!input.active || input.role !== 'admin')) {
		throw new ValidationError('You cannot remove your own administrator access.', {
			role: 'You cannot remove your own administrator access'
		});
	}
	const org = await Organisation.findByPk(person.organisationId);
	if (!org || !ROLES_FOR_KIND[org.kind]?.includes(input.role)) {
		throw new ValidationError(`That role does not fit ${org?.name ?? 'their organisation'}.`, {
			role: 'That role does not fit their organisation'
		});
	}
	await person.update({ role: input.role, active: input.active });
	// Someone switched off is signed out everywhere at once.
	if (!input.active) await Session.destroy({ where: { userId: person.id } });
	await recordAudit(user, 'user.change', 'user', person.id, input);
}
