import { error, fail } from '@sveltejs/kit';
import { message, superValidate, type Infer } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { env } from '$env/dynamic/private';
import { customerJoinSchema, guestJoinSchema } from '$lib/waitlist/schemas';
import { clientAddress } from '$lib/server/auth/requests';
import { shopClock } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import { MailQueueUnavailableError } from '$lib/server/mail';
import { guestJoinLimitProblem, waitlistLinks } from '$lib/server/waitlist/app';
import {
	customerAllowsWaitlistMail,
	customerEntryFor,
	findWaitlistSpecies,
	joinAsCustomer,
	joinAsGuest
} from '$lib/server/waitlist/entries';
import type { Actions, PageServerLoad } from './$types';
import { logger } from '$lib/server/log';

/** What the page says after a press: done, already on it, in stock after all, or refused. */
export type JoinNote = {
	tone: 'done' | 'already' | 'stocked' | 'refused';
	title: string;
	text: string;
};

const CUSTOMER_FORM = 'waitlist-join-customer';
const GUEST_FORM = 'waitlist-join-guest';

async function speciesOr404(slug: string) {
	const species = await findWaitlistSpecies(getDb(), slug);
	if (!species) error(404, 'This shop has no species by that name.');
	return species;
}

export const load: PageServerLoad = async ({ params, locals }) => {
	const db = getDb();
	const species = await speciesOr404(params.slug);
	const clock = await shopClock(db, env.SHOP_TIME_ZONE);
	const user = locals.user;
	if (user) {
		const [entry, mailAllowed] = await Promise.all([
			customerEntryFor(db, user, species.id),
			customerAllowsWaitlistMail(db, user.id)
		]);
		return {
			species,
			clock,
			customer: { email: user.email, entry, mailAllowed },
			customerForm: await superValidate<Infer<typeof customerJoinSchema>, JoinNote>(
				zod4(customerJoinSchema),
				{
					id: CUSTOMER_FORM
				}
			),
			guestForm: null
		};
	}
	return {
		species,
		clock,
		customer: null,
		customerForm: null,
		guestForm: await superValidate<Infer<typeof guestJoinSchema>, JoinNote>(zod4(guestJoinSchema), {
			id: GUEST_FORM
		})
	};
};

const stockedNote = (commonName: string): JoinNote => ({
	tone: 'stocked',
	title: 'In stock now',
	text: `${commonName} came into stock a moment ago, so there is nothing to wait for: see what is on offer.`
});

const queueDownNote: JoinNote = {
	tone: 'refused',
	title: 'Not saved',
	text: 'We could not send the confirmation just now, so nothing was saved. Please try again in a minute.'
};

export const actions: Actions = {
	default: async (event) => {
		const species = await speciesOr404(event.params.slug);
		const db = getDb();
		const user = event.locals.user;
		const ip = clientAddress(event);

		if (user) {
			const form = await superValidate<Infer<typeof customerJoinSchema>, JoinNote>(
				event.request,
				zod4(customerJoinSchema),
				{ id: CUSTOMER_FORM }
			);
			const result = await joinAsCustomer(
				db,
				{ speciesId: species.id, user },
				{ userId: user.id, ip }
			);
			if (!result.ok) return message(form, stockedNote(species.commonName), { status: 409 });
			if (!(await customerAllowsWaitlistMail(db, user.id))) {
				return message(form, {
					tone: 'already',
					title: 'On the list, but mail is off',
					text: 'Your place is kept; turn waitlist mail on in your account to hear when they are listed.'
				});
			}
			return message(
				form,
				result.outcome === 'joined'
					? {
							tone: 'done',
							title: 'You are on the list',
							text: `We will write to ${user.email} once, when a listing of ${species.commonName} goes live.`
						}
					: {
							tone: 'already',
							title: 'Already on it',
							text: 'You are on this waitlist already: nothing more to do.'
						}
			);
		}

		const form = await superValidate<Infer<typeof guestJoinSchema>, JoinNote>(
			event.request,
			zod4(guestJoinSchema),
			{ id: GUEST_FORM }
		);
		if (!form.valid) return fail(400, { form });
		const tooMany = await guestJoinLimitProblem(event, form.data.email);
		if (tooMany)
			return message(form, { tone: 'refused', title: 'Not sent', text: tooMany }, { status: 429 });
		try {
			const result = await joinAsGuest(
				db,
				{ speciesId: species.id, email: form.data.email },
				waitlistLinks(),
				{ userId: null, ip }
			);
			if (!result.ok) return message(form, stockedNote(species.commonName), { status: 409 });
		} catch (cause) {
			if (!(cause instanceof MailQueueUnavailableError)) throw cause;
			logger.error({ err: cause }, '[waitlist] join refused: the mail queue is not installed');
			return message(form, queueDownNote, { status: 503 });
		}
		// The same words whether the address was new, waiting or already confirmed.
		return message(form, {
			tone: 'done',
			title: 'Check your e-mail',
			text: `Unless ${form.data.email} is already on this list, a link to confirm it is on its way; the waitlist counts it once you press the button on that page.`
		});
	}
};
