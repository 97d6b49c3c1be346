import { ROLES } from '$lib/accounts/schemas';
import { listPeople } from '$lib/server/accounts/users';
import { requireRole } from '$lib/server/auth/guard';
import { getDb } from '$lib/server/db';
import type { Role } from '$lib/server/db/schema';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requireRole(event, 'admin');
	const search = event.url.searchParams.get('q')?.slice(0, 100) ?? '';
	const roleParam = event.url.searchParams.get('role') ?? '';
	const role = (ROLES as readonly string[]).includes(roleParam) ? (roleParam as Role) : '';
	return { search, role, people: await listPeople(getDb(), { search, role }) };
};
