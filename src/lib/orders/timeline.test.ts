import { describe, expect, it } from 'vitest';
import { customerActorWords, formatHours, keeperActorWords } from './timeline';

const CUSTOMER = 'user-customer';
const KEEPER = 'user-keeper';

describe('customerActorWords', () => {
	it('names the customer "you" only for their own changes', () => {
		expect(customerActorWords({ actorKind: 'user', actorUserId: CUSTOMER }, CUSTOMER)).toBe('you');
		expect(customerActorWords({ actorKind: 'user', actorUserId: KEEPER }, CUSTOMER)).toBe(
			'the shop'
		);
	});

	it('never calls a guest order\'s changes "you", even with no account on either side', () => {
		expect(customerActorWords({ actorKind: 'user', actorUserId: null }, null)).toBe('the shop');
	});

	it('speaks of payment notices and automatic changes without naming anyone', () => {
		expect(customerActorWords({ actorKind: 'webhook', actorUserId: null }, CUSTOMER)).toBe(
			'payment'
		);
		expect(customerActorWords({ actorKind: 'system', actorUserId: null }, CUSTOMER)).toBe(
			'the shop'
		);
	});
});

describe('keeperActorWords', () => {
	it('prefers the name, then the e-mail, then says the account is gone', () => {
		const base = { actorKind: 'user' as const, actorUserId: KEEPER };
		expect(keeperActorWords({ ...base, name: 'Teo', email: 'teo@example.com' })).toBe('Teo');
		expect(keeperActorWords({ ...base, name: ' ', email: 'teo@example.com' })).toBe(
			'teo@example.com'
		);
		expect(keeperActorWords({ ...base, name: null, email: null })).toBe('a former account');
	});

	it('labels automatic and payment changes', () => {
		const none = { actorUserId: null, name: null, email: null };
		expect(keeperActorWords({ actorKind: 'system', ...none })).toBe('the shop (automatic)');
		expect(keeperActorWords({ actorKind: 'webhook', ...none })).toBe('payment notice');
	});
});

describe('formatHours', () => {
	it('uses the singular for one hour', () => {
		expect(formatHours(1)).toBe('1 hour');
		expect(formatHours(2)).toBe('2 hours');
	});
});
