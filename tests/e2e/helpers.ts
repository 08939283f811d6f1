import { expect, type APIRequestContext, type Page } from '@playwright/test';
import { DEMO_USERS } from '../../src/lib/server/demo-accounts';
import type { Role } from '../../src/lib/access';
import { makeTokenIn } from '../../scripts/lib/own-server';

export const E2E_DATABASE = '.e2e/rollbead.db';

export function demoUser(role: Role) {
	const user = DEMO_USERS.find((u) => u.role === role);
	if (!user) throw new Error(`no demo user with role ${role}`);
	return user;
}

export async function signIn(page: Page, email: string, password: string): Promise<void> {
	await page.goto('/signin');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Sign in' }).click();
}

export async function signInAs(page: Page, role: Role): Promise<void> {
	const user = demoUser(role);
	await signIn(page, user.email, user.password);
	await expect(page.getByTestId('viewer')).toContainText(user.name);
}

/** Make an API token through the real command-line tool, against the e2e database. */
export function makeToken(role: Role, name = `e2e ${role} ${Date.now()}`): string {
	return makeTokenIn(E2E_DATABASE, role, name);
}

export const bearer = (token: string) => ({ Authorization: `Bearer ${token}` });

/** Tokens are slow to make (a process each), so specs share one per role. */
const tokenCache = new Map<Role, string>();
export function tokenFor(role: Role): string {
	let token = tokenCache.get(role);
	if (!token) {
		token = makeToken(role);
		tokenCache.set(role, token);
	}
	return token;
}

export async function apiJson(request: APIRequestContext, path: string, role: Role) {
	const response = await request.get(path, { headers: bearer(tokenFor(role)) });
	expect(response.status(), `${path} as ${role}`).toBe(200);
	return response.json();
}
