/** The navigation each role sees. Hiding a link is a courtesy: every route checks roles on the server. */
import type { Role } from '$lib/roles';

export interface NavItem {
	href: string;
	label: string;
	roles: Role[] | 'all';
}

export const NAV_ITEMS: NavItem[] = [
	{ href: '/', label: 'Bench', roles: 'all' },
	{ href: '/episodes', label: 'Episodes', roles: 'all' },
	{ href: '/shoots', label: 'Shoots', roles: 'all' },
	{ href: '/builds', label: 'Builds', roles: 'all' },
	{ href: '/parts', label: 'Parts', roles: 'all' },
	{ href: '/follow-ups', label: 'Follow-ups', roles: 'all' },
	{ href: '/storage', label: 'Storage', roles: 'all' },
	{ href: '/crew', label: 'Crew', roles: ['producer'] },
	{ href: '/channel', label: 'Channel', roles: ['producer'] },
	{ href: '/account', label: 'Account', roles: 'all' }
];

export function navFor(roles: Role[]): NavItem[] {
	return NAV_ITEMS.filter(
		(item) => item.roles === 'all' || item.roles.some((role) => roles.includes(role))
	);
}
