import { describe, expect, it } from 'vitest';
import { requiredRoleForPath, roleAtLeast } from './roles';

describe('roles', () => {
	it('ranks admin over keeper over customer (PRODUCT.md, "Users and roles")', () => {
		expect(roleAtLeast('admin', 'keeper')).toBe(true);
		expect(roleAtLeast('keeper', 'keeper')).toBe(true);
		expect(roleAtLeast('keeper', 'admin')).toBe(false);
		expect(roleAtLeast('customer', 'keeper')).toBe(false);
	});
	it('maps route trees to the role they need', () => {
		expect(requiredRoleForPath('/manage')).toBe('keeper');
		expect(requiredRoleForPath('/manage/style')).toBe('keeper');
		expect(requiredRoleForPath('/managers')).toBe('public');
		expect(requiredRoleForPath('/admin/users')).toBe('admin');
		expect(requiredRoleForPath('/api/manage/clutches')).toBe('keeper');
		expect(requiredRoleForPath('/api/health')).toBe('public');
		expect(requiredRoleForPath('/account')).toBe('signed_in');
	});
});
