import { redirect } from '@sveltejs/kit';
import { verifyEmail } from '$lib/server/auth/accounts';
import { clientAddress, startSession } from '$lib/server/auth/requests';
import { getDb } from '$lib/server/db';
import type { PageServerLoad } from './$types';

// Opening the link from the mail confirms the address and signs the person in.
export const load: PageServerLoad = async (event) => {
	const outcome = await verifyEmail(getDb(), event.params.token, { ip: clientAddress(event) });
	if (!outcome.ok) return { outcome: outcome.reason };
	await startSession(event.cookies, outcome.userId, event.locals.sessionToken);
	// A fresh request, so the whole page (its header too) sees the new session.
	redirect(303, '/account?welcome=1');
};
