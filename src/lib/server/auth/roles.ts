// Who may do what: each role includes the ones below it (PRODUCT.md, "Users and roles").
import type { Role } from '../db/schema';

const RANK: Record<Role, number> = { customer: 1, keeper: 2, admin: 3 };

export function roleAtLeast(role: Role, minimum: Role): boolean {
	return RANK[role] >= RANK[minimum];
}

/** What a route tree needs: the back office is for keepers, /admin for the owner. */
export function requiredRoleForPath(pathname: string): Role | 'public' | 'signed_in' {
	if (pathname === '/admin' || pathname.startsWith('/admin/')) return 'admin';
	if (pathname === '/manage' || pathname.startsWith('/manage/')) return 'keeper';
	if (pathname.startsWith('/api/admin/')) return 'admin';
	if (pathname.startsWith('/api/manage/')) return 'keeper';
	if (pathname === '/account' || pathname.startsWith('/account/')) return 'signed_in';
	return 'public';
}
