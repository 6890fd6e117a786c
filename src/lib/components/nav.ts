import type { Role } from '../domain/vocabulary';

export interface NavItem {
	href: string;
	label: string;
}

export const NAV_BY_ROLE: Record<Role, NavItem[]> = {
	fleet_manager: [
		{ href: '/fleet', label: 'Vans' },
		{ href: '/fleet/visits', label: 'Visits' },
		{ href: '/fleet/people', label: 'Invite' },
		{ href: '/fleet/imports', label: 'Imports' },
		{ href: '/fleet/settings', label: 'Fleet settings' }
	],
	workshop: [
		{ href: '/workshop', label: 'Queue' },
		{ href: '/workshop/visits', label: 'Visits' },
		{ href: '/workshop/capacity', label: 'Capacity' },
		{ href: '/workshop/imports', label: 'Imports' }
	],
	driver: [{ href: '/driver', label: 'My van' }],
	admin: [
		{ href: '/admin', label: 'Organisations and people' },
		{ href: '/admin/people', label: 'Invite' },
		{ href: '/admin/jobs', label: 'Job runs' },
		{ href: '/admin/mailbox', label: 'Mailbox' }
	]
};

export const ROLE_LABEL: Record<Role, string> = {
	fleet_manager: 'Fleet manager',
	workshop: 'Workshop',
	driver: 'Driver',
	admin: 'Administrator'
};
