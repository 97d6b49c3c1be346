// The app-edge wiring of waitlists for routes: links from the app's origin and secret,
// and the guest-join limit with its audit entry. Scripts and tests use entries.ts directly.
import type { RequestEvent } from '@sveltejs/kit';
import { authSettings, origin } from '../auth';
import { clientAddress } from '../auth/requests';
import { writeAudit } from '../audit';
import { getDb, getPool } from '../db';
import type { WaitlistLinks } from './links';
import { createWaitlistLimits, type WaitlistLimits } from './limits';

let limits: WaitlistLimits | undefined;

export function waitlistLinks(): WaitlistLinks {
	return { origin: origin(), secret: authSettings().secret };
}

/** null when the guest may join now; otherwise the sentence to show. A burst is audited once. */
export async function guestJoinLimitProblem(
	event: Pick<RequestEvent, 'getClientAddress'>,
	email: string
): Promise<string | null> {
	limits ??= createWaitlistLimits(getPool());
	const address = clientAddress(event);
	const verdict = await limits.consume(address ?? 'unknown', email);
	if (verdict.allowed) return null;
	if (verdict.firstRefusal) {
		await writeAudit(getDb(), {
			actorUserId: null,
			actorIp: address,
			action: 'waitlist.limit_reached',
			entity: 'waitlist_entry',
			detail: { email: email.toLowerCase() }
		});
	}
	const minutes = Math.ceil(verdict.retryAfterSeconds / 60);
	return `Too many tries. Please wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again.`;
}
