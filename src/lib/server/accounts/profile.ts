// The signed-in customer's own profile: name, default shipping address, mail choices.
import type { Kysely } from 'kysely';
import type { Database } from '../db/schema';
import { writeAudit } from '../audit';

export type Profile = {
	name: string;
	ship_name: string;
	ship_line1: string;
	ship_line2: string;
	ship_city: string;
	ship_state: string;
	ship_zip: string;
	wants_waitlist_mail: boolean;
	wants_stock_news: boolean;
};

export async function loadProfile(db: Kysely<Database>, userId: string): Promise<Profile> {
	const row = await db
		.selectFrom('User as u')
		.leftJoin('user_profile as p', 'p.user_id', 'u.id')
		.select([
			'u.name',
			'p.ship_name',
			'p.ship_line1',
			'p.ship_line2',
			'p.ship_city',
			'p.ship_state',
			'p.ship_zip',
			'p.wants_waitlist_mail',
			'p.wants_stock_news'
		])
		.where('u.id', '=', userId)
		.executeTakeFirstOrThrow();
	return {
		name: row.name ?? '',
		ship_name: row.ship_name ?? '',
		ship_line1: row.ship_line1 ?? '',
		ship_line2: row.ship_line2 ?? '',
		ship_city: row.ship_city ?? '',
		ship_state: row.ship_state ?? '',
		ship_zip: row.ship_zip ?? '',
		wants_waitlist_mail: row.wants_waitlist_mail ?? false,
		wants_stock_news: row.wants_stock_news ?? false
	};
}

export async function saveProfile(
	db: Kysely<Database>,
	userId: string,
	profile: Profile,
	actorIp: string | null
): Promise<void> {
	const orNull = (value: string) => (value === '' ? null : value);
	const address = {
		ship_name: orNull(profile.ship_name),
		ship_line1: orNull(profile.ship_line1),
		ship_line2: orNull(profile.ship_line2),
		ship_city: orNull(profile.ship_city),
		ship_state: orNull(profile.ship_state),
		ship_zip: orNull(profile.ship_zip),
		wants_waitlist_mail: profile.wants_waitlist_mail,
		wants_stock_news: profile.wants_stock_news
	};
	await db.transaction().execute(async (trx) => {
		await trx.updateTable('User').set({ name: profile.name }).where('id', '=', userId).execute();
		await trx
			.insertInto('user_profile')
			.values({ user_id: userId, ...address })
			.onConflict((oc) => oc.column('user_id').doUpdateSet({ ...address, updated_at: new Date() }))
			.execute();
		await writeAudit(trx, {
			actorUserId: userId,
			actorIp,
			action: 'account.profile_saved',
			entity: 'user',
			entityId: userId,
			detail: {
				hasAddress: address.ship_zip !== null,
				wantsWaitlistMail: address.wants_waitlist_mail,
				wantsStockNews: address.wants_stock_news
			}
		});
	});
}

/**
 * Joining a waitlist is asking to be told: the account's "tell me when a species on my
 * waitlist is ready" choice is switched on with it (in the caller's transaction), so a
 * profile saved earlier with the box unticked does not silently swallow the notice.
 */
export async function wantWaitlistMail(db: Kysely<Database>, userId: string): Promise<boolean> {
	const before = await db
		.selectFrom('user_profile')
		.select('wants_waitlist_mail')
		.where('user_id', '=', userId)
		.executeTakeFirst();
	if (before?.wants_waitlist_mail) return false;
	await db
		.insertInto('user_profile')
		.values({ user_id: userId, wants_waitlist_mail: true })
		.onConflict((oc) =>
			oc.column('user_id').doUpdateSet({ wants_waitlist_mail: true, updated_at: new Date() })
		)
		.execute();
	return true;
}
