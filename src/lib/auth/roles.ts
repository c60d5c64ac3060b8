// Roles and where each lands. Pure: used by the server guards and the app shell.

export const roles = ['owner', 'service_writer', 'foreman', 'technician'] as const;
export type Role = (typeof roles)[number];

export const roleLabels: Record<Role, string> = {
	owner: 'Owner',
	service_writer: 'Service writer',
	foreman: 'Foreman',
	technician: 'Technician'
};

/** Each role's home after sign-in. */
export function homeFor(role: Role): string {
	switch (role) {
		case 'technician':
			return '/bench';
		case 'foreman':
			return '/floor';
		case 'service_writer':
		case 'owner':
			return '/jobs';
	}
}

export interface NavItem {
	href: string;
	label: string;
	roles: readonly Role[];
}

/** The app's areas and who may open them. */
export const navItems: readonly NavItem[] = [
	{ href: '/bench', label: 'Bench', roles: ['technician', 'foreman', 'owner'] },
	{ href: '/floor', label: 'Floor', roles: ['foreman', 'owner'] },
	{ href: '/jobs', label: 'Jobs', roles: ['service_writer', 'owner', 'foreman'] },
	{ href: '/vehicles', label: 'Vehicles', roles: ['service_writer', 'owner', 'foreman'] },
	{ href: '/procedures', label: 'Procedures', roles: ['owner', 'foreman', 'service_writer'] },
	{ href: '/shop', label: 'Shop', roles: ['owner'] }
];

export function navFor(role: Role): NavItem[] {
	return navItems.filter((item) => item.roles.includes(role));
}

/**
 * Where to go after sign-in: the page asked for when it is a same-site path the role may
 * open, else the role's home. Refuses protocol-relative and absolute URLs (open redirects).
 */
export function landingFor(role: Role, next: string | null | undefined): string {
	if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) {
		return homeFor(role);
	}
	const area = navItems.find((item) => next === item.href || next.startsWith(item.href + '/'));
	if (area && !area.roles.includes(role)) return homeFor(role);
	if (next.startsWith('/sign-in') || next.startsWith('/api/')) return homeFor(role);
	return next;
}
