import type { Role } from '../domain/vocabulary';

export interface NavItem {
	href: string;
	label: string;
}

export const NAV_BY_ROLE: Record<Role, NavItem[]> = {
	fleet_manager: [{ href: '/fleet', label: 'Vans' }],
	workshop: [{ href: '/workshop', label: 'Contracted vans' }],
	driver: [{ href: '/driver', label: 'My van' }],
	admin: [{ href: '/admin', label: 'Organisations and people' }]
};

export const ROLE_LABEL: Record<Role, string> = {
	fleet_manager: 'Fleet manager',
	workshop: 'Workshop',
	driver: 'Driver',
	admin: 'Administrator'
};
