// The owner's view of outgoing mail (/admin/mail): what failed, what waits, what
// went out lately, and "send again" for a failed row.
import { sql, type Kysely } from 'kysely';
import { writeAudit } from '../audit';
import type { Database, MailStatus } from '../db/schema';
import { enqueueOutgoingMail } from '.';
import type { MailKind } from './templates';

export interface OutgoingMailEntry {
	id: number;
	kind: string;
	kindLabel: string;
	toAddress: string;
	subject: string;
	status: MailStatus;
	attempts: number;
	lastError: string | null;
	createdAt: Date;
	sentAt: Date | null;
}

export interface OutgoingMailLedger {
	/** Failed first (newest first), then queued (longest waiting first), then the latest sent. */
	entries: OutgoingMailEntry[];
	counts: Record<MailStatus, number>;
	/** How many sent rows the list shows at most. */
	sentShown: number;
}

const kindLabels: Record<MailKind, string> = {
	verify_email: 'Confirm e-mail',
	sign_in_link: 'Sign-in link',
	password_reset: 'Password reset',
	account_exists: 'Account already exists',
	password_changed: 'Password changed',
	ship_date_set: 'Ship date set',
	ship_date_lost: 'Ship date withdrawn',
	waitlist_confirm: 'Waitlist confirmation',
	waitlist_ready: 'Waitlist: species ready',
	order_receipt: 'Order receipt',
	refund_issued: 'Refund sent',
	refund_failed: 'Refund failed (admins)',
	claim_received: 'Claim received',
	claim_filed: 'Claim waiting (admins)',
	claim_decided: 'Claim decided',
	ship_notice: 'Ship notice',
	delivery_late: 'Late delivery'
};

export function mailKindLabel(kind: string): string {
	return kindLabels[kind as MailKind] ?? kind.replaceAll('_', ' ');
}

export async function listOutgoingMail(
	db: Kysely<Database>,
	options: { sentLimit?: number } = {}
): Promise<OutgoingMailLedger> {
	const sentShown = options.sentLimit ?? 50;
	const columns = [
		'id',
		'kind',
		'to_address',
		'subject',
		'status',
		'attempts',
		'last_error',
		'created_at',
		'sent_at'
	] as const;
	const [failed, queued, sent, totals] = await Promise.all([
		db
			.selectFrom('outgoing_mail')
			.select(columns)
			.where('status', '=', 'failed')
			.orderBy('updated_at', 'desc')
			.orderBy('id', 'desc')
			.execute(),
		db
			.selectFrom('outgoing_mail')
			.select(columns)
			.where('status', '=', 'queued')
			.orderBy('created_at', 'asc')
			.orderBy('id', 'asc')
			.execute(),
		db
			.selectFrom('outgoing_mail')
			.select(columns)
			.where('status', '=', 'sent')
			.orderBy('sent_at', 'desc')
			.orderBy('id', 'desc')
			.limit(sentShown)
			.execute(),
		db
			.selectFrom('outgoing_mail')
			.select(['status', sql<number>`count(*)::int`.as('count')])
			.groupBy('status')
			.execute()
	]);
	const counts: Record<MailStatus, number> = { failed: 0, queued: 0, sent: 0 };
	for (const row of totals) counts[row.status] = row.count;
	return {
		entries: [...failed, ...queued, ...sent].map((row) => ({
			id: row.id,
			kind: row.kind,
			kindLabel: mailKindLabel(row.kind),
			toAddress: row.to_address,
			subject: row.subject,
			status: row.status,
			attempts: row.attempts,
			lastError: row.last_error,
			createdAt: row.created_at,
			sentAt: row.sent_at
		})),
		counts,
		sentShown
	};
}

export interface MailActor {
	userId: string;
	ip: string | null;
}

/**
 * Puts a failed row back in the queue with a fresh send job, and audits it, in one
 * transaction. Returns null when the row is not (or no longer) failed.
 */
export async function resendFailedMail(
	db: Kysely<Database>,
	id: number,
	actor: MailActor
): Promise<{ id: number; toAddress: string } | null> {
	return db.transaction().execute(async (trx) => {
		const row = await trx
			.updateTable('outgoing_mail')
			.set({ status: 'queued', updated_at: sql`now()` })
			.where('id', '=', id)
			.where('status', '=', 'failed')
			.returning(['id', 'kind', 'to_address', 'attempts', 'last_error'])
			.executeTakeFirst();
		if (!row) return null;
		await enqueueOutgoingMail(trx, row.id);
		await writeAudit(trx, {
			actorUserId: actor.userId,
			actorIp: actor.ip,
			action: 'mail.resend',
			entity: 'outgoing_mail',
			entityId: row.id,
			detail: {
				to: row.to_address,
				kind: row.kind,
				attemptsBefore: row.attempts,
				lastError: row.last_error
			}
		});
		return { id: row.id, toAddress: row.to_address };
	});
}
