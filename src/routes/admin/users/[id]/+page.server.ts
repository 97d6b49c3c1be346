import { error, fail } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { message, setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { disableSchema, roleChangeSchema } from '$lib/accounts/schemas';
import { changeRole, findPerson, setDisabled } from '$lib/server/accounts/users';
import { requireRole } from '$lib/server/auth/guard';
import { clientAddress } from '$lib/server/auth/requests';
import { resolveShopTimeZone } from '$lib/server/backoffice/settings';
import { getDb } from '$lib/server/db';
import type { Actions, PageServerLoad } from './$types';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

async function personOr404(id: string) {
	// Not a uuid is not an account; PostgreSQL would refuse to compare it.
	const person = UUID.test(id) ? await findPerson(getDb(), id) : null;
	if (!person) error(404, 'No such account.');
	return person;
}

export const load: PageServerLoad = async (event) => {
	const me = requireRole(event, 'admin');
	const person = await personOr404(event.params.id);
	return {
		person,
		isMe: person.id === me.id,
		timeZone: await resolveShopTimeZone(getDb(), env.SHOP_TIME_ZONE),
		roleForm: await superValidate(
			{ userId: person.id, role: person.role },
			zod4(roleChangeSchema),
			{ id: 'role' }
		),
		disableForm: await superValidate(
			{ userId: person.id, disabled: !person.disabledAt },
			zod4(disableSchema),
			{
				id: 'disable'
			}
		)
	};
};

export const actions: Actions = {
	role: async (event) => {
		const me = requireRole(event, 'admin');
		const form = await superValidate(event.request, zod4(roleChangeSchema), { id: 'role' });
		if (!form.valid || form.data.userId !== event.params.id) return fail(400, { roleForm: form });
		const outcome = await changeRole(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			form.data.userId,
			form.data.role
		);
		if (!outcome.ok) return setError(form, 'role', outcome.problem);
		return message(form, 'Role saved. It applies from their next request.');
	},
	disable: async (event) => {
		const me = requireRole(event, 'admin');
		const form = await superValidate(event.request, zod4(disableSchema), { id: 'disable' });
		if (!form.valid || form.data.userId !== event.params.id)
			return fail(400, { disableForm: form });
		const outcome = await setDisabled(
			getDb(),
			{ userId: me.id, ip: clientAddress(event) },
			form.data.userId,
			form.data.disabled
		);
		if (!outcome.ok) return setError(form, 'userId', outcome.problem);
		return message(
			form,
			form.data.disabled ? 'Account disabled; its sessions ended.' : 'Account enabled again.'
		);
	}
};
