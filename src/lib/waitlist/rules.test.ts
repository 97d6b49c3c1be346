import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	CONFIRM_LINK_DAYS,
	confirmLinkExpired,
	confirmLinkExpiresAt,
	customerJoinStep,
	guestJoinStep,
	normaliseWaitlistEmail,
	standingOf,
	type EntryState
} from './rules';

const at = (iso: string) => new Date(iso);
const unconfirmed: EntryState = { confirmedAt: null, notifiedAt: null };
const waiting: EntryState = { confirmedAt: at('2026-11-01T10:00:00Z'), notifiedAt: null };
const told: EntryState = {
	confirmedAt: at('2026-11-01T10:00:00Z'),
	notifiedAt: at('2026-11-20T08:00:00Z')
};

describe('guest joins', () => {
	it('makes, renews or leaves an entry alone', () => {
		expect(guestJoinStep(null)).toBe('create');
		expect(guestJoinStep(unconfirmed)).toBe('reissue');
		expect(guestJoinStep(told)).toBe('reissue');
		expect(guestJoinStep(waiting)).toBe('nothing');
	});

	it('never disturbs a confirmed entry that is still waiting, whatever else is true', () => {
		const maybeDate = fc.option(fc.date({ noInvalidDate: true }), { nil: null });
		fc.assert(
			fc.property(maybeDate, maybeDate, (confirmedAt, notifiedAt) => {
				const step = guestJoinStep({ confirmedAt, notifiedAt });
				expect(step === 'nothing').toBe(confirmedAt !== null && notifiedAt === null);
			})
		);
	});
});

describe('customer joins', () => {
	it('confirms at once and says when they are already on', () => {
		expect(customerJoinStep(null)).toBe('create');
		expect(customerJoinStep(unconfirmed)).toBe('confirm');
		expect(customerJoinStep(told)).toBe('rejoin');
		expect(customerJoinStep(waiting)).toBe('already');
	});
});

describe('confirm links', () => {
	it('work for seven days to the millisecond', () => {
		const sent = at('2026-12-01T15:30:00Z');
		// A day is 86 400 SI seconds (ISO 8601 uses UTC days): 7 days = 604 800 000 ms.
		expect(confirmLinkExpiresAt(sent).getTime() - sent.getTime()).toBe(604_800_000);
		expect(CONFIRM_LINK_DAYS).toBe(7);
		expect(confirmLinkExpired(sent, at('2026-12-08T15:29:59.999Z'))).toBe(false);
		expect(confirmLinkExpired(sent, at('2026-12-08T15:30:00.000Z'))).toBe(true);
	});

	it('count in UTC, so a daylight-saving change in between does not move the end', () => {
		// US clocks fell back on Sun Nov 1, 2026 (the first Sunday of November, per the
		// Energy Policy Act of 2005); the link still lasts 168 hours of real time.
		const sent = at('2026-10-29T12:00:00Z');
		expect(confirmLinkExpiresAt(sent).toISOString()).toBe('2026-11-05T12:00:00.000Z');
	});
});

describe('standing', () => {
	it('names where an entry stands', () => {
		expect(standingOf(unconfirmed)).toBe('unconfirmed');
		expect(standingOf(waiting)).toBe('waiting');
		expect(standingOf(told)).toBe('told');
	});
});

describe('addresses', () => {
	it('are stored trimmed and lower-case, one mailbox one entry', () => {
		expect(normaliseWaitlistEmail('  Dagny.Halvorsen@Example.COM ')).toBe(
			'dagny.halvorsen@example.com'
		);
	});
});
