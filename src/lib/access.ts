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
/** Who reads the audit trail (who changed which record, when, before and after). */
export const AUDIT_READERS: readonly Role[] = ['quality', 'admin'];
/** Who may take or hand on a signal on the floor (everyone who works there; viewers read). */
export const SIGNAL_ASSIGNERS: readonly Role[] = ['technician', 'quality', 'engineer', 'admin'];
/**
 * Who may acknowledge signals from a line's view: the SPC editors, and technicians, who may
 * acknowledge the open signals of that line only (never edit charts, limits or the cause lists).
 */
export const LINE_ACKNOWLEDGERS: readonly Role[] = ['technician', ...SPC_EDITORS];

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

/** One page of the main navigation; `roles` decides who sees it (and who may open it). */
export type Section = { href: string; label: string; roles: readonly Role[]; icon: string };

/** Navigation groups, one per job; each role sees the groups that hold a page it may open. */
export type NavGroup = {
	id: 'stencils' | 'print' | 'inspection' | 'spc' | 'factory' | 'audit' | 'admin';
	label: string;
	/** One line for the overview page: what the group is for. */
	purpose: string;
	sections: readonly Section[];
};

export const NAV_GROUPS: readonly NavGroup[] = [
	{
		id: 'stencils',
		label: 'Stencils',
		purpose: 'Check apertures, area and aspect ratio and powder type before a stencil is ordered.',
		sections: [
			{ href: '/stencils', label: 'Stencils', roles: ALL_ROLES, icon: 'layers' },
			{ href: '/stencil-life', label: 'Stencil life', roles: ALL_ROLES, icon: 'layers' }
		]
	},
	{
		id: 'print',
		label: 'Print log',
		purpose: 'Log print runs against recipe windows; paste lots and their handling times.',
		sections: [
			{ href: '/print-runs', label: 'Print runs', roles: ALL_ROLES, icon: 'clipboard-list' },
			{ href: '/recipes', label: 'Recipes', roles: ALL_ROLES, icon: 'sliders-horizontal' },
			{ href: '/paste-lots', label: 'Paste lots', roles: ALL_ROLES, icon: 'package' }
		]
	},
	{
		id: 'inspection',
		label: 'Inspection',
		purpose: 'Solder-paste inspection imports, boards and their pads, failing pads by refdes.',
		sections: [
			{ href: '/spi', label: 'SPI imports', roles: ALL_ROLES, icon: 'scan-line' },
			{ href: '/boards', label: 'Boards', roles: ALL_ROLES, icon: 'search' },
			{ href: '/trace', label: 'Board trace', roles: ALL_ROLES, icon: 'route' }
		]
	},
	{
		id: 'spc',
		label: 'Control charts',
		purpose: 'X-bar/R and individuals charts, capability, and run-rule signals to act on.',
		sections: [
			{ href: '/charts', label: 'Charts', roles: ALL_ROLES, icon: 'chart-line' },
			{ href: '/signals', label: 'Signals', roles: ALL_ROLES, icon: 'bell' },
			{ href: '/study', label: 'Ad-hoc study', roles: ALL_ROLES, icon: 'calculator' },
			{ href: '/analysis', label: 'Analysis', roles: ALL_ROLES, icon: 'chart-scatter' }
		]
	},
	{
		id: 'factory',
		label: 'Factory',
		purpose: 'Lines and products: the codes every run, stencil and inspection belongs to.',
		sections: [{ href: '/factory', label: 'Lines & products', roles: ALL_ROLES, icon: 'factory' }]
	},
	{
		id: 'audit',
		label: 'Audit',
		purpose: 'Who changed which record, when, before and after; read only, with a CSV export.',
		sections: [{ href: '/audit', label: 'Audit trail', roles: AUDIT_READERS, icon: 'history' }]
	},
	{
		id: 'admin',
		label: 'Admin',
		purpose: 'People and roles, API tokens and IPC-CFX messages for machines, and the mail outbox.',
		sections: [
			{ href: '/admin/users', label: 'People', roles: ADMIN_ONLY, icon: 'users' },
			{ href: '/admin/tokens', label: 'API tokens', roles: ADMIN_ONLY, icon: 'key' },
			{ href: '/admin/outbox', label: 'Mail outbox', roles: ADMIN_ONLY, icon: 'mail' },
			{ href: '/admin/cfx', label: 'Machine messages', roles: ADMIN_ONLY, icon: 'radio' }
		]
	}
];

/** Every page of the navigation, flat. */
export const SECTIONS: readonly Section[] = [
	{ href: '/', label: 'Overview', roles: ALL_ROLES, icon: 'gauge' },
	...NAV_GROUPS.flatMap((group) => group.sections)
];

/** Which job comes first for each role, on the overview and in the menu. */
const GROUP_ORDER: Record<Role, NavGroup['id'][]> = {
	admin: ['admin', 'factory', 'stencils', 'print', 'inspection', 'spc', 'audit'],
	engineer: ['stencils', 'print', 'spc', 'inspection', 'factory', 'audit', 'admin'],
	technician: ['print', 'stencils', 'inspection', 'spc', 'factory', 'audit', 'admin'],
	quality: ['spc', 'inspection', 'print', 'stencils', 'factory', 'audit', 'admin'],
	viewer: ['spc', 'inspection', 'print', 'stencils', 'factory', 'audit', 'admin']
};

/** The navigation for one role: its groups in its order, each with only the pages it may open. */
export function navigationFor(role: Role): NavGroup[] {
	return GROUP_ORDER[role]
		.map((id) => NAV_GROUPS.find((group) => group.id === id)!)
		.map((group) => ({ ...group, sections: group.sections.filter((s) => s.roles.includes(role)) }))
		.filter((group) => group.sections.length > 0);
}

/**
 * Page access by route prefix, checked in hooks for every page request. The longest matching
 * prefix wins; anything not listed is open to every signed-in role.
 */
export const PAGE_POLICY: readonly { prefix: string; roles: readonly Role[] }[] = [
	{ prefix: '/admin', roles: ADMIN_ONLY },
	{ prefix: '/audit', roles: AUDIT_READERS },
	{ prefix: '/print-runs/new', roles: PRINT_LOGGERS },
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
