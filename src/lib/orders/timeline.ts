// Who moved an order, in words fit for the reader. Customers see only "you", "the
// shop" or "payment" — never a staff member's name or e-mail; keepers see the person.
import type { ActorKind } from '$lib/server/db/schema';

export interface EventActor {
	actorKind: ActorKind;
	actorUserId: string | null;
}

/** The customer's words for whoever made a change to their order. */
export function customerActorWords(actor: EventActor, orderUserId: string | null): string {
	if (actor.actorKind === 'webhook') return 'payment';
	if (actor.actorKind === 'user' && actor.actorUserId !== null && actor.actorUserId === orderUserId)
		return 'you';
	return 'the shop';
}

/** The keeper's words: the person by name (else e-mail), or what the automatic change was. */
export function keeperActorWords(
	actor: EventActor & { name: string | null; email: string | null }
): string {
	if (actor.actorKind === 'webhook') return 'payment notice';
	if (actor.actorKind === 'system') return 'the shop (automatic)';
	return actor.name?.trim() || actor.email || 'a former account';
}

/** Whole hours as a reader says them: "2 hours", "1 hour", "36 hours". */
export function formatHours(hours: number): string {
	return `${hours} ${hours === 1 ? 'hour' : 'hours'}`;
}
