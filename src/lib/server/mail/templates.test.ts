import { describe, expect, it } from 'vitest';
import {
	LOST_DATE_REASONS_SHOWN,
	MAIL_KINDS,
	checkedLink,
	escapeHtml,
	formatLifetime,
	renderMail,
	type MailMessage
} from './templates';

const shop = { shopName: 'Mossback Hollow Inverts' };
const link = 'https://shop.example.com/account/verify?token=9f2c&next=%2Forders';

const oneOfEach: MailMessage[] = [
	{ kind: 'verify_email', to: 'ada@example.com', name: 'Ada', url: link, expiresInMinutes: 1440 },
	{ kind: 'sign_in_link', to: 'ada@example.com', url: link, expiresInMinutes: 15 },
	{ kind: 'password_reset', to: 'ada@example.com', name: 'Ada', url: link, expiresInMinutes: 60 },
	{ kind: 'account_exists', to: 'ada@example.com', url: link, expiresInMinutes: 60 },
	{ kind: 'password_changed', to: 'ada@example.com', name: 'Ada' },
	{
		kind: 'ship_date_set',
		to: 'ada@example.com',
		name: 'Ada',
		orderNumber: 'HL-10012',
		service: 'overnight',
		shipDate: '2026-12-08',
		deliveryDate: '2026-12-09',
		packs: ['heat'],
		facilityPickup: true,
		previousShipDate: null
	},
	{
		kind: 'ship_date_lost',
		to: 'ada@example.com',
		name: 'Ada',
		orderNumber: 'HL-10011',
		previousShipDate: '2026-12-02',
		heldBy: 'forecast',
		reasons: [
			'Low of 14 °F (−10 °C) at the destination on Wed, Dec 2, 2026 is below the 25 °F (−4 °C) hold limit.'
		]
	},
	{
		kind: 'waitlist_confirm',
		to: 'ada@example.com',
		commonName: 'Desert millipede',
		scientificName: 'Orthoporus ornatus',
		url: link,
		leaveUrl: 'https://shop.example.com/waitlist/leave/7.abc',
		expiresInMinutes: 7 * 24 * 60
	},
	{
		kind: 'waitlist_ready',
		to: 'ada@example.com',
		name: 'Ada',
		commonName: 'Desert millipede',
		scientificName: 'Orthoporus ornatus',
		listingTitle: 'Desert millipedes, sub-adult, unsexed',
		priceFromCents: 2450,
		listingUrl: 'https://shop.example.com/listings/orthoporus-ornatus-sub-adult',
		leaveUrl: 'https://shop.example.com/waitlist/leave/7.abc'
	},
	{
		kind: 'order_receipt',
		to: 'ada@example.com',
		name: 'Ada',
		orderNumber: 'HL-10013',
		service: 'overnight',
		lines: [{ description: 'Rubber ducky isopods, juvenile', quantity: 3, lineTotalCents: 5400 }],
		subtotalCents: 5400,
		shippingCents: 4500,
		totalCents: 9900,
		hasLive: true,
		orderUrl: 'https://shop.example.com/checkout/done?session_id=cs_test_1'
	},
	{
		kind: 'refund_issued',
		to: 'ada@example.com',
		name: 'Ada',
		orderNumber: 'HL-10013',
		amountCents: 1800,
		remainingCents: 8100,
		reason: 'One juvenile arrived dead.',
		lines: [{ description: 'Rubber ducky isopods, juvenile', quantity: 1 }]
	},
	{
		kind: 'refund_failed',
		to: 'wren@mossback.example.com',
		orderNumber: 'HL-10013',
		amountCents: 1800,
		stripeRefundId: 're_test_1',
		orderUrl: 'https://shop.example.com/manage/orders/HL-10013'
	},
	{
		kind: 'claim_received',
		to: 'ada@example.com',
		name: 'Ada',
		orderNumber: 'HL-10013',
		lines: [{ description: 'Rubber ducky isopods, juvenile', deadCount: 2 }],
		photoCount: 1,
		orderUrl: 'https://shop.example.com/account/orders/HL-10013'
	},
	{
		kind: 'claim_filed',
		to: 'wren@mossback.example.com',
		orderNumber: 'HL-10013',
		customer: 'Ada Lind, ada@example.com',
		deadCount: 2,
		claimUrl: 'https://shop.example.com/admin/claims/4'
	},
	{
		kind: 'claim_decided',
		to: 'ada@example.com',
		name: 'Ada',
		orderNumber: 'HL-10013',
		outcome: 'reship',
		note: 'Two more from the same clutch.',
		reshipOrderNumber: 'HL-10020',
		orderUrl: 'https://shop.example.com/account/orders/HL-10013'
	},
	{
		kind: 'ship_notice',
		to: 'ada@example.com',
		name: 'Ada',
		orderNumber: 'HL-10012',
		service: 'overnight',
		carrier: 'USPS',
		trackingNumber: '9400111202555842332669',
		trackingUrl: 'https://tools.usps.com/go/TrackConfirmAction?tLabels=9400111202555842332669',
		shippedOn: '2026-12-08',
		expectedDeliveryOn: '2026-12-09',
		packs: ['heat'],
		facilityPickup: false,
		hasLive: true,
		claimWindowHours: 2,
		orderUrl: 'https://shop.example.com/account/orders/HL-10012'
	},
	{
		kind: 'delivery_late',
		to: 'ada@example.com',
		name: 'Ada',
		orderNumber: 'HL-10009',
		carrier: 'UPS',
		trackingNumber: '1Z5R89390357567127',
		trackingUrl: 'https://wwwapps.ups.com/WebTracking/track?track=yes&trackNums=1Z5R89390357567127',
		expectedDeliveryOn: '2026-12-02',
		hasLive: true,
		claimWindowHours: 2,
		orderUrl: 'https://shop.example.com/account/orders/HL-10009'
	}
];

/** Tags as a mail client would read them: "<" followed by a letter, "/" or "!". */
const HTML_TAG = /<[a-z!/][^>]*>/i;

describe('renderMail', () => {
	it('renders every kind', () => {
		expect(oneOfEach.map((message) => message.kind).sort()).toEqual([...MAIL_KINDS].sort());
		for (const message of oneOfEach) {
			const mail = renderMail(message, shop);
			expect(mail.subject).toContain('Mossback Hollow Inverts');
			expect(mail.html).toMatch(/^<!doctype html>/);
			expect(mail.text.length).toBeGreaterThan(80);
		}
	});

	it('escapes a name with a script in it, in the HTML part', () => {
		const mail = renderMail(
			{
				kind: 'verify_email',
				to: 'mallory@example.test',
				name: '<script>alert("x")</script>',
				url: link,
				expiresInMinutes: 1440
			},
			shop
		);
		expect(mail.html).not.toContain('<script>');
		expect(mail.html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;');
		expect(mail.text).toContain('Hello <script>alert("x")</script>,');
	});

	it('escapes the shop name and keeps a stored name on one line', () => {
		const mail = renderMail(
			{ kind: 'password_changed', to: 'ada@example.com', name: 'Ada\r\nBcc: x@example.test' },
			{ shopName: 'Roaches & <Co>' }
		);
		expect(mail.html).toContain('Roaches &amp; &lt;Co&gt;');
		expect(mail.html).not.toContain('<Co>');
		expect(mail.text).toContain('Hello Ada Bcc: x@example.test,');
		expect(mail.subject).toBe('Your Roaches & <Co> password was changed');
	});

	it('puts the link in both parts, the HTML one escaped in its href', () => {
		for (const message of oneOfEach) {
			if (!('url' in message)) continue;
			const mail = renderMail(message, shop);
			expect(mail.text).toContain(link);
			expect(mail.html).toContain(`href="${link.replaceAll('&', '&amp;')}"`);
			expect(mail.html).not.toContain(link); // the raw "&" never appears unescaped
		}
	});

	it('writes a text part with no HTML tags in it', () => {
		for (const message of oneOfEach) {
			const mail = renderMail(message, shop);
			expect(mail.text).not.toMatch(HTML_TAG);
			expect(mail.text).not.toContain('&amp;');
		}
	});

	it('names the lifetime of each link in both parts', () => {
		const cases: [MailMessage, string][] = [
			[oneOfEach[0]!, '24 hours'],
			[oneOfEach[1]!, '15 minutes'],
			[oneOfEach[2]!, '1 hour'],
			[oneOfEach[3]!, '1 hour']
		];
		for (const [message, words] of cases) {
			const mail = renderMail(message, shop);
			expect(mail.text).toContain(`expires in ${words}`);
			expect(mail.html).toContain(words);
		}
	});

	it('greets without a name when there is none', () => {
		const mail = renderMail(
			{ kind: 'password_reset', to: 'a@example.com', name: '  ', url: link, expiresInMinutes: 30 },
			shop
		);
		expect(mail.text.startsWith('Hello,\n')).toBe(true);
	});

	it('refuses a link that is not a web address', () => {
		expect(() =>
			renderMail(
				{
					kind: 'sign_in_link',
					to: 'a@example.com',
					url: 'javascript:alert(1)',
					expiresInMinutes: 15
				},
				shop
			)
		).toThrow(RangeError);
		expect(() => checkedLink('/relative/path')).toThrow(RangeError);
		expect(checkedLink('http://127.0.0.1:3000/x')).toBe('http://127.0.0.1:3000/x');
	});
});

describe('ship date mail', () => {
	// Weekdays checked with Python's datetime: 2026-12-02 Wednesday, 2026-12-08 Tuesday.
	it('tells a held order its ship and delivery dates, its pack, pickup and the cautions', () => {
		const mail = renderMail(oneOfEach[5]!, shop);
		expect(mail.subject).toBe('Your Mossback Hollow Inverts order HL-10012 ships Tue, Dec 8, 2026');
		expect(mail.text).toContain('the weather on the route has settled');
		expect(mail.text).toContain(
			'It ships on Tue, Dec 8, 2026 by overnight service and should arrive on Wed, Dec 9, 2026.'
		);
		expect(mail.text).toContain('with a heat pack');
		expect(mail.text).not.toContain('cold pack');
		expect(mail.text).toContain('collect it that same day');
		for (const title of ['Heat packs in a sealed box', "Your state's rules"]) {
			expect(mail.text).toContain(title);
		}
		expect(mail.html).toContain('USDA APHIS');
		expect(mail.html).toContain('Your state&#39;s rules');
	});

	it('says where a moved date moved from', () => {
		const moved = { ...(oneOfEach[5] as Extract<MailMessage, { kind: 'ship_date_set' }>) };
		moved.previousShipDate = '2026-12-02';
		moved.packs = [];
		moved.facilityPickup = false;
		const mail = renderMail(moved, shop);
		expect(mail.subject).toBe(
			'New ship date for your Mossback Hollow Inverts order HL-10012: Tue, Dec 8, 2026'
		);
		expect(mail.text).toContain('has moved from Wed, Dec 2, 2026 to Tue, Dec 8, 2026');
		expect(mail.text).not.toContain('pack, because');
		expect(mail.text).not.toContain('carrier facility for pickup rather');
	});

	it('tells a scheduled order why its date is gone and what happens next', () => {
		const mail = renderMail(oneOfEach[6]!, shop);
		expect(mail.subject).toBe(
			'Your Mossback Hollow Inverts order HL-10011 is waiting for safe weather'
		);
		expect(mail.text).toContain('was due to ship on Wed, Dec 2, 2026');
		expect(mail.text).toContain('– Low of 14 °F (−10 °C) at the destination');
		expect(mail.text).toContain('checked again every morning');
	});

	it('names the first few reasons of a long hold and counts the rest', () => {
		const reasons = Array.from({ length: LOST_DATE_REASONS_SHOWN + 2 }, (_, i) => `Reading ${i}.`);
		const mail = renderMail(
			{ ...(oneOfEach[6] as Extract<MailMessage, { kind: 'ship_date_lost' }>), reasons },
			shop
		);
		expect(mail.text).toContain(`– Reading ${LOST_DATE_REASONS_SHOWN - 1}.`);
		expect(mail.text).not.toContain(`Reading ${LOST_DATE_REASONS_SHOWN}.`);
		expect(mail.text).toContain('– and 2 more readings like these.');
		const none = renderMail(
			{ ...(oneOfEach[6] as Extract<MailMessage, { kind: 'ship_date_lost' }>), reasons: [] },
			shop
		);
		expect(none.text).toContain('outside what the animals can travel in');
		expect(none.text).not.toContain('What the forecast says');
	});

	it("does not blame the forecast for a keeper's hold", () => {
		const mail = renderMail(
			{
				...(oneOfEach[6] as Extract<MailMessage, { kind: 'ship_date_lost' }>),
				heldBy: 'keeper'
			},
			shop
		);
		expect(mail.text).toContain('the shop has put it on hold to keep the animals safe');
		expect(mail.text).not.toContain('forecast rules that out');
		expect(mail.text).not.toContain('What the forecast says');
		expect(mail.text).not.toContain('Low of 14');
	});

	it('escapes a reason with markup in it', () => {
		const mail = renderMail(
			{
				...(oneOfEach[6] as Extract<MailMessage, { kind: 'ship_date_lost' }>),
				reasons: ['<b>x</b>']
			},
			shop
		);
		expect(mail.html).toContain('&lt;b&gt;x&lt;/b&gt;');
		expect(mail.html).not.toContain('<b>x</b>');
	});
});

describe('waitlist mail', () => {
	it('asks a guest to confirm, says how long the link works, and offers a way off', () => {
		const mail = renderMail(oneOfEach[7]!, shop);
		expect(mail.subject).toBe(
			'Confirm your place on the Mossback Hollow Inverts waitlist for Desert millipede'
		);
		expect(mail.text).toContain('Desert millipede (Orthoporus ornatus)');
		expect(mail.text).toContain('expires in 7 days');
		expect(mail.text).toContain(
			'take it off this waitlist now: https://shop.example.com/waitlist/leave/7.abc'
		);
		expect(mail.html).toContain('href="https://shop.example.com/waitlist/leave/7.abc"');
	});

	it('tells a waiting keeper the listing, its price from, the link, the notes and the way off', () => {
		const mail = renderMail(oneOfEach[8]!, shop);
		expect(mail.subject).toBe('Ready now at Mossback Hollow Inverts: Desert millipede');
		expect(mail.text.startsWith('Hello Ada,\n')).toBe(true);
		// 2450 cents is $24.50: 100 cents to the dollar (ISO 4217 gives USD two minor digits).
		expect(mail.text).toContain('Desert millipedes, sub-adult, unsexed, from $24.50 an animal.');
		expect(mail.text).toContain(
			'See the listing:\nhttps://shop.example.com/listings/orthoporus-ornatus-sub-adult'
		);
		expect(mail.text).toContain('Weather and the live-arrival guarantee.');
		expect(mail.text).toContain("Your state's rules.");
		expect(mail.text).not.toContain('Heat packs in a sealed box');
		expect(mail.text).toContain(
			'Leave this waitlist: https://shop.example.com/waitlist/leave/7.abc'
		);
		expect(mail.html).toContain('USDA APHIS');
	});

	it('escapes a listing title with markup and refuses a leave link that is not a web address', () => {
		const ready = oneOfEach[8] as Extract<MailMessage, { kind: 'waitlist_ready' }>;
		const mail = renderMail({ ...ready, listingTitle: '<img src=x onerror=alert(1)>' }, shop);
		expect(mail.html).toContain('&lt;img src=x onerror=alert(1)&gt;');
		expect(mail.html).not.toContain('<img');
		expect(() => renderMail({ ...ready, leaveUrl: 'javascript:alert(1)' }, shop)).toThrow(
			RangeError
		);
	});
});

describe('helpers', () => {
	it('escapes the five HTML specials', () => {
		expect(escapeHtml(`<a href="x">Tom & Jo's</a>`)).toBe(
			'&lt;a href=&quot;x&quot;&gt;Tom &amp; Jo&#39;s&lt;/a&gt;'
		);
	});

	it('words a lifetime the way people say it', () => {
		expect(formatLifetime(1)).toBe('1 minute');
		expect(formatLifetime(15)).toBe('15 minutes');
		expect(formatLifetime(90)).toBe('90 minutes');
		expect(formatLifetime(120)).toBe('2 hours');
		expect(formatLifetime(1440)).toBe('24 hours');
		expect(formatLifetime(4320)).toBe('3 days');
		expect(() => formatLifetime(0)).toThrow(RangeError);
		expect(() => formatLifetime(2.5)).toThrow(RangeError);
	});
});

describe('order receipt', () => {
	it('lists the lines and the total, with the live-arrival terms and the care-sheet note', () => {
		const receipt = oneOfEach.find((message) => message.kind === 'order_receipt')!;
		const mail = renderMail(receipt, shop);
		// 9900 cents is $99.00: USD has two minor units (ISO 4217).
		expect(mail.subject).toBe('Receipt for your Mossback Hollow Inverts order HL-10013: $99.00');
		expect(mail.text).toContain('3 × Rubber ducky isopods, juvenile: $54.00');
		expect(mail.text).toContain('total paid $99.00');
		expect(mail.text).toContain('live-arrival guarantee');
		expect(mail.text).toContain("Your state's rules");
		expect(mail.text).toContain('Care sheet.');
	});
});

describe('claim mail', () => {
	const find = <K extends MailMessage['kind']>(kind: K) =>
		oneOfEach.find(
			(message): message is Extract<MailMessage, { kind: K }> => message.kind === kind
		)!;

	it('tells the buyer the claim is in, with the dead counts and that shipping is not refunded', () => {
		const mail = renderMail(find('claim_received'), shop);
		expect(mail.subject).toBe('Mossback Hollow Inverts has your claim on order HL-10013');
		expect(mail.text).toContain('2 dead: Rubber ducky isopods, juvenile');
		expect(mail.text).toContain('with 1 photo:');
		// PRODUCT.md's guarantee defaults (common practice): shipping cost is not refunded.
		expect(mail.text).toContain('Shipping is not refunded');
		expect(mail.text).toContain('https://shop.example.com/account/orders/HL-10013');
	});

	it('names the customer and escapes their stored name in the admin alert', () => {
		const mail = renderMail(find('claim_filed'), shop);
		expect(mail.subject).toBe('Mossback Hollow Inverts: a DOA claim on HL-10013 waits for you');
		expect(mail.text).toContain('Ada Lind, ada@example.com filed a dead-on-arrival claim');
		expect(mail.text).toContain('for 2 animals, with photos.');
		const marked = renderMail({ ...find('claim_filed'), customer: 'Ada <img src=x>' }, shop);
		expect(marked.html).toContain('Ada &lt;img src=x&gt;');
		expect(marked.html).not.toContain('<img src=x>');
	});

	it('names the no-charge reship order, and gives a decline its reason', () => {
		const reship = renderMail(find('claim_decided'), shop);
		expect(reship.subject).toBe(
			'Mossback Hollow Inverts will send your animals again (order HL-10013)'
		);
		expect(reship.text).toContain('at no charge, as order HL-10020.');
		expect(reship.text).toContain('From the shop: Two more from the same clutch.');
		const decline = renderMail(
			{
				...find('claim_decided'),
				outcome: 'decline',
				note: 'The parcel was refused at the first attempt.',
				reshipOrderNumber: null
			},
			shop
		);
		expect(decline.subject).toBe('Mossback Hollow Inverts declined your claim on order HL-10013');
		expect(decline.text).toContain('Why: The parcel was refused at the first attempt.');
		expect(decline.text).not.toContain('no charge');
	});

	it('says a claim refund settles the claim, and a plain refund does not', () => {
		const plain = renderMail(find('refund_issued'), shop);
		expect(plain.text).not.toContain('your claim');
		const claim = renderMail({ ...find('refund_issued'), forClaim: true }, shop);
		expect(claim.text).toContain('We have looked at your claim on order HL-10013');
		// 1800 cents is $18.00: USD has two minor units (ISO 4217).
		expect(claim.text).toContain('We have sent $18.00 back');
	});
});

describe('ship notice and late delivery', () => {
	const find = <K extends MailMessage['kind']>(kind: K) =>
		oneOfEach.find(
			(message): message is Extract<MailMessage, { kind: K }> => message.kind === kind
		)!;

	// Weekdays checked with GNU date: 2026-12-08 Tuesday, 2026-12-09 Wednesday, 2026-12-02 Wednesday.
	it('says when and how the box left, the tracking link, the pack and what to do on arrival', () => {
		const mail = renderMail(find('ship_notice'), shop);
		expect(mail.subject).toBe('Your Mossback Hollow Inverts order HL-10012 has shipped');
		expect(mail.text).toContain(
			'left the shop on Tue, Dec 8, 2026 by USPS overnight service and should arrive on Wed, Dec 9, 2026.'
		);
		expect(mail.text).toContain(
			'USPS tracking number: 9400111202555842332669 (follow it on the USPS site: https://tools.usps.com/go/TrackConfirmAction?tLabels=9400111202555842332669).'
		);
		expect(mail.html).toContain(
			'href="https://tools.usps.com/go/TrackConfirmAction?tLabels=9400111202555842332669"'
		);
		expect(mail.text).toContain('travels with a heat pack');
		expect(mail.text).not.toContain('cold pack, because');
		// PRODUCT.md's arrival cautions: open at once, room temperature, photo first, the window.
		for (const words of [
			'Open it at once.',
			'70–79 °F (21–26 °C)',
			'before you move anything',
			'within 2 hours of delivery',
			'first delivery attempt and not redirected',
			"Your state's rules.",
			'USDA APHIS'
		])
			expect(mail.text).toContain(words);
		const open = mail.text.indexOf('Open it at once');
		expect(open).toBeLessThan(mail.text.indexOf('If one is dead, photo first'));
	});

	it('tells a hand-delivered box apart, with no tracking and no facility advice', () => {
		const mail = renderMail(
			{
				...find('ship_notice'),
				carrier: 'hand',
				trackingNumber: null,
				trackingUrl: null,
				facilityPickup: true,
				expectedDeliveryOn: '2026-12-08'
			},
			shop
		);
		expect(mail.subject).toBe('Your Mossback Hollow Inverts order HL-10012 is on its way by hand');
		expect(mail.text).toContain('to be handed over in person, on Tue, Dec 8, 2026.');
		expect(mail.text).not.toContain('tracking number');
		expect(mail.text).not.toContain('carrier facility');
	});

	it('advises facility pickup when the check did, and skips the animal steps for supplies', () => {
		const pickup = renderMail({ ...find('ship_notice'), facilityPickup: true, packs: [] }, shop);
		expect(pickup.text).toContain('collect it that same day');
		expect(pickup.text).not.toContain('pack, because');
		const supplies = renderMail({ ...find('ship_notice'), hasLive: false, packs: [] }, shop);
		expect(supplies.text).not.toContain('photo first');
		expect(supplies.text).toContain('open it and check everything is there');
	});

	it('escapes a tracking number with markup in it', () => {
		const mail = renderMail(
			{ ...find('ship_notice'), trackingNumber: '<b>1Z</b>', trackingUrl: null },
			shop
		);
		expect(mail.html).toContain('&lt;b&gt;1Z&lt;/b&gt;');
		expect(mail.html).not.toContain('<b>1Z</b>');
	});

	it('tells a late box what to do, without redirecting it, and the claim window', () => {
		const mail = renderMail(find('delivery_late'), shop);
		expect(mail.subject).toBe('Your Mossback Hollow Inverts order HL-10009 is running late');
		expect(mail.text).toContain('was due to arrive on Wed, Dec 2, 2026');
		expect(mail.text).toContain('UPS tracking number: 1Z5R89390357567127');
		expect(mail.text).toContain('do not have it sent to another address');
		expect(mail.text).toContain('before you move anything');
		expect(mail.text).toContain('within 2 hours of delivery');
		expect(mail.text).toContain('Open it at once.');
		const supplies = renderMail({ ...find('delivery_late'), hasLive: false }, shop);
		expect(supplies.text).not.toContain('photo first');
	});
});
