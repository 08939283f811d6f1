import { expect, test } from '@playwright/test';
import { readdirSync, readFileSync } from 'node:fs';
import { get as httpGet } from 'node:http';
import { join, relative, sep } from 'node:path';
import { ROLES } from '../../src/lib/access';
import { API_POLICY, type HttpMethod } from '../../src/lib/server/api-policy';
import { bearer, tokenFor } from './helpers';

/** Every +server.ts under src/routes/api with the methods it exports. */
function apiRoutes(): { routeId: string; methods: HttpMethod[] }[] {
	const root = 'src/routes';
	const found: { routeId: string; methods: HttpMethod[] }[] = [];
	const walk = (dir: string) => {
		for (const entry of readdirSync(dir, { withFileTypes: true })) {
			const path = join(dir, entry.name);
			if (entry.isDirectory()) walk(path);
			else if (entry.name === '+server.ts') {
				const source = readFileSync(path, 'utf8');
				const methods = [
					...source.matchAll(
						/export\s+(?:const|async function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g
					)
				].map((m) => m[1] as HttpMethod);
				const routeId = '/' + relative(root, dir).split(sep).join('/');
				found.push({ routeId, methods });
			}
		}
	};
	walk(join(root, 'api'));
	return found;
}

const routes = apiRoutes();

test('every API route and method declares its roles, and every declaration has a route', () => {
	expect(routes.length).toBeGreaterThan(4);
	for (const { routeId, methods } of routes) {
		for (const method of methods) {
			expect(
				API_POLICY[routeId]?.[method],
				`${method} ${routeId} has no entry in API_POLICY`
			).toBeDefined();
		}
	}
	for (const [routeId, methods] of Object.entries(API_POLICY)) {
		const route = routes.find((r) => r.routeId === routeId);
		expect(route, `API_POLICY names ${routeId}, which has no +server.ts`).toBeDefined();
		for (const method of Object.keys(methods)) {
			expect(
				route?.methods,
				`API_POLICY names ${method} ${routeId}, which is not exported`
			).toContain(method);
		}
	}
});

/** GET of an event stream never ends: read its status only, then hang up. */
function streamStatus(
	url: string,
	headers: Record<string, string>
): Promise<{ status: () => number }> {
	return new Promise((resolve, reject) => {
		const req = httpGet(url, { headers }, (res) => {
			const status = res.statusCode ?? 0;
			req.destroy();
			resolve({ status: () => status });
		});
		req.on('error', reject);
	});
}

test('the server enforces the declared roles on every API route', async ({ request, baseURL }) => {
	for (const { routeId, methods } of routes) {
		// Parameters get an id that does not exist: the guard must answer before any lookup.
		const path = routeId.replace(/\[[^\]]+\]/g, '999999');
		for (const method of methods) {
			const policy = API_POLICY[routeId]![method]!;
			const call = (headers: Record<string, string>) =>
				method === 'GET' && routeId.endsWith('/stream')
					? streamStatus(baseURL + path, headers)
					: request.fetch(path, { method, headers, data: method === 'GET' ? undefined : {} });
			const anonymous = await call({});
			if (policy === 'public') {
				expect(anonymous.status(), `${method} ${path} is public`).toBeLessThan(400);
				continue;
			}
			expect(anonymous.status(), `${method} ${path} without credentials`).toBe(401);
			for (const role of ROLES) {
				const status = (await call(bearer(tokenFor(role)))).status();
				if (policy.includes(role)) {
					expect([401, 403], `${method} ${path} as ${role} (allowed)`).not.toContain(status);
				} else {
					expect(status, `${method} ${path} as ${role} (not allowed)`).toBe(403);
				}
			}
		}
	}
});
