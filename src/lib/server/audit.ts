// The audit log: who did what, when, and from which address. Every mutation
// writes one entry, inside the same transaction as the change it records.
import type { Kysely } from 'kysely';
import type { Database } from './db/schema';

/** Who makes a change: the signed-in user and the address they came from. */
export type Actor = { userId: string; ip: string | null };

export type AuditEntry = {
	actorUserId: string | null;
	actorIp: string | null;
	action: string;
	entity: string;
	entityId?: string | number | null;
	detail?: Record<string, unknown>;
};

export async function writeAudit(db: Kysely<Database>, entry: AuditEntry): Promise<void> {
	await db
		.insertInto('audit_log')
		.values({
			actor_user_id: entry.actorUserId,
			actor_ip: entry.actorIp,
			action: entry.action,
			entity: entry.entity,
			entity_id: entry.entityId == null ? null : String(entry.entityId),
			detail: JSON.stringify(entry.detail ?? {})
		})
		.execute();
}
