import { error, fail } from '@sveltejs/kit';
import { CatcherUnreachableError, clearCaughtMail, listCaughtMail } from '$lib/server/mail/catcher';
import { outboxTimeZone, requireMailCatcher } from '$lib/server/mail/env';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const base = requireMailCatcher();
	try {
		return { messages: await listCaughtMail(base), timeZone: outboxTimeZone() };
	} catch (cause) {
		if (cause instanceof CatcherUnreachableError) error(503, cause.message);
		throw cause;
	}
};

export const actions: Actions = {
	clear: async () => {
		const base = requireMailCatcher();
		try {
			await clearCaughtMail(base);
		} catch (cause) {
			if (cause instanceof CatcherUnreachableError) return fail(503, { problem: cause.message });
			throw cause;
		}
		return { cleared: true };
	}
};
