import { requireRole } from '$lib/server/auth/guard';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requireRole(event, 'keeper');
	return { seesMoney: user.role === 'admin' };
};
