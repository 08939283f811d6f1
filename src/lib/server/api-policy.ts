import {
	ALL_ROLES,
	ADMIN_ONLY,
	AUDIT_READERS,
	ENGINEERING,
	INSPECTION_IMPORTERS,
	PRINT_LOGGERS,
	SPC_EDITORS,
	SIGNAL_ASSIGNERS,
	type Role
} from '../access';

export type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
export type MethodPolicy = readonly Role[] | 'public';

/**
 * Who may call each JSON API route, keyed by SvelteKit route id and method. hooks.server.ts
 * enforces it before the route runs and `apiRoute` checks it again; a method missing here is
 * refused (fail closed). tests/unit/api-policy.test.ts checks every +server.ts against this table.
 */
export const API_POLICY: Record<string, Partial<Record<HttpMethod, MethodPolicy>>> = {
	'/api/health': { GET: 'public' },
	'/api/me': { GET: ALL_ROLES },
	'/api/users': { GET: ADMIN_ONLY },
	'/api/audit': { GET: AUDIT_READERS },
	'/api/audit/export.csv': { GET: AUDIT_READERS },
	'/api/lines': { GET: ALL_ROLES, POST: ENGINEERING },
	'/api/lines/overview': { GET: ALL_ROLES },
	'/api/lines/stream': { GET: ALL_ROLES },
	'/api/products': { GET: ALL_ROLES, POST: ENGINEERING },
	'/api/products/fit': { GET: ALL_ROLES },
	'/api/products/[id=id]/fit': { GET: ALL_ROLES, PUT: ENGINEERING },
	'/api/recipes': { GET: ALL_ROLES, POST: ENGINEERING },
	'/api/print-runs': { GET: ALL_ROLES, POST: PRINT_LOGGERS },
	'/api/print-runs/trends': { GET: ALL_ROLES },
	'/api/print-runs/export.csv': { GET: ALL_ROLES },
	'/api/print-runs/[id=id]': { GET: ALL_ROLES },
	'/api/print-runs/[id=id]/end': { POST: PRINT_LOGGERS },
	'/api/print-runs/[id=id]/corrections': { POST: PRINT_LOGGERS },
	'/api/paste-lots': { GET: ALL_ROLES, POST: PRINT_LOGGERS },
	'/api/paste-lots/[lot]': { GET: ALL_ROLES },
	'/api/paste-lots/[lot]/events': { POST: PRINT_LOGGERS },
	'/api/stencil-life': { GET: ALL_ROLES },
	'/api/stencil-life/[id=id]/entries': { POST: PRINT_LOGGERS },
	'/api/stencils': { GET: ALL_ROLES, POST: ENGINEERING },
	'/api/stencils/[id=id]': { GET: ALL_ROLES },
	'/api/stencils/[id=id]/apertures': { GET: ALL_ROLES, POST: ENGINEERING },
	'/api/stencil-thresholds': { GET: ALL_ROLES, PUT: ENGINEERING },
	'/api/stencil-thresholds/learned': { GET: ALL_ROLES, POST: ENGINEERING },
	'/api/spc/analyze': { POST: ALL_ROLES },
	'/api/charts': { GET: ALL_ROLES },
	'/api/charts/[id=id]': { GET: ALL_ROLES },
	'/api/signals': { GET: ALL_ROLES },
	'/api/signals/[id=id]/acknowledge': { POST: SPC_EDITORS },
	'/api/signals/[id=id]/assignee': { PUT: SIGNAL_ASSIGNERS },
	'/api/spi/imports': { GET: ALL_ROLES, POST: INSPECTION_IMPORTERS },
	'/api/spi/imports/[id=id]': { GET: ALL_ROLES },
	'/api/spi/imports/progress/[job]': { GET: ALL_ROLES },
	'/api/spi/profiles': { GET: ALL_ROLES, POST: INSPECTION_IMPORTERS },
	'/api/spi/profiles/[id=id]': {
		GET: ALL_ROLES,
		PUT: INSPECTION_IMPORTERS,
		DELETE: INSPECTION_IMPORTERS
	},
	'/api/spi/pareto': { GET: ALL_ROLES },
	'/api/boards': { GET: ALL_ROLES },
	'/api/boards/[id=id]': { GET: ALL_ROLES },
	'/api/analysis/transfer-efficiency': { GET: ALL_ROLES },
	'/api/analysis/parameters': { GET: ALL_ROLES },
	'/api/analysis/stencil-wear': { GET: ALL_ROLES },
	'/api/analysis/predicted-te': { GET: ALL_ROLES },
	'/api/cfx/status': { GET: ALL_ROLES },
	'/api/cfx/endpoints': { GET: ALL_ROLES, POST: ADMIN_ONLY },
	'/api/cfx/quarantine': { GET: ENGINEERING },
	'/api/cfx/quarantine/[id=id]/retry': { POST: ADMIN_ONLY },
	'/api/cfx/quarantine/[id=id]/discard': { POST: ADMIN_ONLY },
	'/api/cfx/pending': { GET: ALL_ROLES },
	'/api/cfx/pending/[id=id]/assign': { POST: INSPECTION_IMPORTERS },
	'/api/cfx/oee': { GET: ALL_ROLES },
	'/api/cfx/changeovers': { GET: ALL_ROLES },
	'/api/cfx/events': { GET: ALL_ROLES },
	'/api/analysis/yield': { GET: ALL_ROLES },
	'/api/analysis/failure-map': { GET: ALL_ROLES },
	'/api/trace': { GET: ALL_ROLES }
};

export function apiPolicyFor(routeId: string | null, method: string): MethodPolicy | undefined {
	if (!routeId) return undefined;
	const methodKey = (method === 'HEAD' ? 'GET' : method) as HttpMethod;
	return API_POLICY[routeId]?.[methodKey];
}
