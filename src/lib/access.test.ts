import { describe, expect, it } from 'vitest';
import { hasRole, isRole, pageRolesFor, SECTIONS } from './access';

describe('access', () => {
	it.each([
		['/admin', ['admin']],
		['/admin/users', ['admin']],
		['/administrator', ['admin', 'engineer', 'technician', 'quality', 'viewer']],
		['/factory', ['admin', 'engineer', 'technician', 'quality', 'viewer']]
	])('%s is open to %j', (path, roles) => {
		expect([...pageRolesFor(path)].sort()).toEqual([...roles].sort());
	});

	it('navigation offers each section only to roles the page policy admits', () => {
		for (const section of SECTIONS) {
			for (const role of section.roles) expect(pageRolesFor(section.href)).toContain(role);
		}
	});

	it('recognises roles and checks them', () => {
		expect(isRole('quality')).toBe(true);
		expect(isRole('boss')).toBe(false);
		expect(hasRole(null, ['admin'])).toBe(false);
		expect(hasRole({ kind: 'token', id: 1, name: 't', role: 'viewer' }, ['viewer'])).toBe(true);
	});
});
