/**
 * Roles, who is acting, and which parts of Rollbead each role may use. Client-safe: the
 * navigation reads it to show each role only what it may open; the server enforces the same table.
 */

export const ROLES = ['admin', 'engineer', 'technician', 'quality', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
	admin: 'Administrator',
	engineer: 'Process engineer',
	technician: 'Line technician',
	quality: 'Quality engineer',
	viewer: 'Viewer'
};

export const ALL_ROLES: readonly Role[] = ROLES;
export const ENGINEERING: readonly Role[] = ['engineer', 'admin'];
export const PRINT_LOGGERS: readonly Role[] = ['technician', 'engineer', 'admin'];
export const INSPECTION_IMPORTERS: readonly Role[] = ['quality', 'engineer', 'admin'];
export const ADMIN_ONLY: readonly Role[] = ['admin'];
/** Who configures charts, freezes limits and acknowledges signals; everyone else reads. */
export const SPC_EDITORS: readonly Role[] = ['quality', 'engineer', 'admin'];

export function isRole(value: unknown): value is Role {
	return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

/** The signed-in person or the API token a request acts as. */
export type Actor =
	| { kind: 'user'; id: number; email: string; name: string; role: Role }
	| { kind: 'token'; id: number; name: string; role: Role };

export function hasRole(actor: Actor | null | undefined, allowed: readonly Role[]): boolean {
	return !!actor && allowed.includes(actor.role);
}

/** One entry of the main navigation; `roles` decides who sees it (and who may open it). */
export type Section = { href: string; label: string; roles: readonly Role[]; icon: string };

export const SECTIONS: readonly Section[] = [
	{ href: '/', label: 'Overview', roles: ALL_ROLES, icon: 'gauge' },
	{ href: '/admin/users', label: 'People', roles: ADMIN_ONLY, icon: 'users' },
	{ href: '/admin/tokens', label: 'API tokens', roles: ADMIN_ONLY, icon: 'key' },
	{ href: '/admin/outbox', label: 'Mail outbox', roles: ADMIN_ONLY, icon: 'mail' },
	{ href: '/factory', label: 'Lines & products', roles: ALL_ROLES, icon: 'factory' },
	{ href: '/runs', label: 'Print runs', roles: ALL_ROLES, icon: 'clipboard-list' },
	{ href: '/recipes', label: 'Recipes', roles: ALL_ROLES, icon: 'sliders-horizontal' },
	{ href: '/paste', label: 'Paste lots', roles: ALL_ROLES, icon: 'package' },
	{ href: '/stencil-life', label: 'Stencil life', roles: ALL_ROLES, icon: 'layers' },
	{ href: '/stencils', label: 'Stencils', roles: ALL_ROLES, icon: 'layers' },
	{ href: '/charts', label: 'Charts', roles: ALL_ROLES, icon: 'chart-line' },
	{ href: '/signals', label: 'Signals', roles: ALL_ROLES, icon: 'bell' },
	{ href: '/study', label: 'Ad-hoc study', roles: ALL_ROLES, icon: 'calculator' },
	{ href: '/spi', label: 'SPI imports', roles: ALL_ROLES, icon: 'scan-line' },
	{ href: '/boards', label: 'Boards', roles: ALL_ROLES, icon: 'search' }
];

/**
 * Page access by route prefix, checked in hooks for every page request. The longest matching
 * prefix wins; anything not listed is open to every signed-in role.
 */
export const PAGE_POLICY: readonly { prefix: string; roles: readonly Role[] }[] = [
	{ prefix: '/admin', roles: ADMIN_ONLY },
	{ prefix: '/runs/new', roles: PRINT_LOGGERS },
	{ prefix: '/recipes/edit', roles: ENGINEERING },
	{ prefix: '/spi/upload', roles: INSPECTION_IMPORTERS },
	{ prefix: '/spi/profiles', roles: INSPECTION_IMPORTERS }
];

export function pageRolesFor(pathname: string): readonly Role[] {
	let best: { prefix: string; roles: readonly Role[] } | undefined;
	for (const entry of PAGE_POLICY) {
		const matches = pathname === entry.prefix || pathname.startsWith(entry.prefix + '/');
		if (matches && (!best || entry.prefix.length > best.prefix.length)) best = entry;
	}
	return best?.roles ?? ALL_ROLES;
}
