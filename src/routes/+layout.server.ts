import type { LayoutServerLoad } from './$types';

// What reaches the browser about the signer-in is this whitelist, never a row.
export const load: LayoutServerLoad = async ({ locals }) => ({
	user: locals.user
		? {
				id: locals.user.id,
				name: locals.user.name,
				email: locals.user.email,
				role: locals.user.role
			}
		: null
});
