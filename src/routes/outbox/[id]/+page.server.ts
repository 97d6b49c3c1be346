import { error } from '@sveltejs/kit';
import { CatcherUnreachableError, linksInMail, readCaughtMail } from '$lib/server/mail/catcher';
import { outboxTimeZone, requireMailCatcher } from '$lib/server/mail/env';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const base = requireMailCatcher();
	if (!/^[0-9a-z-]{1,64}$/i.test(params.id)) error(404, 'No such message in the catcher.');
	let message;
	try {
		message = await readCaughtMail(base, params.id);
	} catch (cause) {
		if (cause instanceof CatcherUnreachableError) error(503, cause.message);
		throw cause;
	}
	if (!message) error(404, 'No such message in the catcher; it may have been emptied.');
	return { message, links: linksInMail(message), timeZone: outboxTimeZone() };
};
