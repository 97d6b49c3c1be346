// The shop's e-mails, rendered to an HTML part and a plain-text part. Pure: no I/O and
// no clock, so every word and every escape is checked by templates.test.ts.
//
// Mail clients ignore style sheets and web fonts unevenly, so the HTML is a single
// table column with inline styles, and the same words are always in the text part.
//
// Relative imports: scripts load this module through the job runner, outside SvelteKit.
import { formatShopDate } from '../../format/dates';
import { formatCents } from '../../format/money';
import { shippingCautions } from '../../shipping/cautions';
import { arrivalSteps } from '../../fulfilment/arrival';
import { carrierLabels, type Carrier } from '../../fulfilment/carriers';

/** Every e-mail the shop sends, as the data it is rendered from. */
export type MailMessage =
	| {
			kind: 'verify_email';
			to: string;
			name: string | null;
			url: string;
			expiresInMinutes: number;
	  }
	| { kind: 'sign_in_link'; to: string; url: string; expiresInMinutes: number }
	| {
			kind: 'password_reset';
			to: string;
			name: string | null;
			url: string;
			expiresInMinutes: number;
	  }
	/** Sent instead of a verification when the address already has an account; `url` resets its password. */
	| { kind: 'account_exists'; to: string; url: string; expiresInMinutes: number }
	| { kind: 'password_changed'; to: string; name: string | null }
	/** A held order got a ship date, or a scheduled one moved to a later date. */
	| {
			kind: 'ship_date_set';
			to: string;
			name: string | null;
			orderNumber: string;
			service: 'overnight' | 'two_day';
			shipDate: string;
			deliveryDate: string;
			packs: ('heat' | 'cold')[];
			facilityPickup: boolean;
			/** The date it had before, when a set date moved; null when it was on weather hold. */
			previousShipDate: string | null;
	  }
	/**
	 * A scheduled order lost its date: to the forecast (`reasons` are the check's
	 * sentences) or to a keeper's hold, whose own reason stays in the back office.
	 */
	| {
			kind: 'ship_date_lost';
			to: string;
			name: string | null;
			orderNumber: string;
			previousShipDate: string;
			heldBy: 'forecast' | 'keeper';
			reasons: string[];
	  }
	/** A guest asked to join a species' waitlist; `url` confirms it, `leaveUrl` takes the entry off. */
	| {
			kind: 'waitlist_confirm';
			to: string;
			commonName: string;
			scientificName: string;
			url: string;
			leaveUrl: string;
			expiresInMinutes: number;
	  }
	/** A listing of a waitlisted species went live; sent once per entry. */
	| {
			kind: 'waitlist_ready';
			to: string;
			name: string | null;
			commonName: string;
			scientificName: string;
			listingTitle: string;
			/** The listing's lowest price for one animal, in cents. */
			priceFromCents: number;
			listingUrl: string;
			leaveUrl: string;
	  }
	/** The receipt of a paid order: what was bought and paid, and the terms that go with it. */
	| {
			kind: 'order_receipt';
			to: string;
			name: string | null;
			orderNumber: string;
			service: 'overnight' | 'two_day';
			lines: { description: string; quantity: number; lineTotalCents: number }[];
			subtotalCents: number;
			shippingCents: number;
			totalCents: number;
			hasLive: boolean;
			orderUrl: string;
	  }
	/** Money went back to the buyer's card: all of it, or part with what it was for. */
	| {
			kind: 'refund_issued';
			to: string;
			name: string | null;
			orderNumber: string;
			amountCents: number;
			/** What is left paid on the order after this refund; 0 when it is refunded in full. */
			remainingCents: number;
			reason: string;
			lines: { description: string; quantity: number }[];
			/** The refund settles the buyer's dead-on-arrival claim: the mail says the claim is decided. */
			forClaim?: boolean;
	  }
	/** To the shop's admins: a refund the card network turned back; the amount counts as held again. */
	| {
			kind: 'refund_failed';
			to: string;
			orderNumber: string;
			amountCents: number;
			stripeRefundId: string;
			orderUrl: string;
	  }
	/** To the buyer: their dead-on-arrival claim is in, and what happens next. */
	| {
			kind: 'claim_received';
			to: string;
			name: string | null;
			orderNumber: string;
			lines: { description: string; deadCount: number }[];
			photoCount: number;
			orderUrl: string;
	  }
	/** To the shop's admins: a claim waits for a decision. */
	| {
			kind: 'claim_filed';
			to: string;
			orderNumber: string;
			customer: string;
			deadCount: number;
			claimUrl: string;
	  }
	/** To the buyer: the claim was settled by sending the animals again, or declined. */
	| {
			kind: 'claim_decided';
			to: string;
			name: string | null;
			orderNumber: string;
			outcome: 'reship' | 'decline';
			/** The admin's words: the reason for a decline, or a note with the reship. */
			note: string;
			/** The new no-charge order of a reship. */
			reshipOrderNumber: string | null;
			orderUrl: string;
	  }
	/** The box has left: how it travels, how to follow it, and what to do when it comes. */
	| {
			kind: 'ship_notice';
			to: string;
			name: string | null;
			orderNumber: string;
			service: 'overnight' | 'two_day';
			carrier: Carrier;
			/** Null for hand delivery. */
			trackingNumber: string | null;
			trackingUrl: string | null;
			shippedOn: string;
			expectedDeliveryOn: string;
			packs: ('heat' | 'cold')[];
			facilityPickup: boolean;
			hasLive: boolean;
			claimWindowHours: number;
			orderUrl: string;
	  }
	/** The box is past its expected delivery day and not reported delivered. */
	| {
			kind: 'delivery_late';
			to: string;
			name: string | null;
			orderNumber: string;
			carrier: Carrier;
			trackingNumber: string | null;
			trackingUrl: string | null;
			expectedDeliveryOn: string;
			hasLive: boolean;
			claimWindowHours: number;
			orderUrl: string;
	  };

export type MailKind = MailMessage['kind'];

export const MAIL_KINDS = [
	'verify_email',
	'sign_in_link',
	'password_reset',
	'account_exists',
	'password_changed',
	'ship_date_set',
	'ship_date_lost',
	'waitlist_confirm',
	'waitlist_ready',
	'order_receipt',
	'refund_issued',
	'refund_failed',
	'claim_received',
	'claim_filed',
	'claim_decided',
	'ship_notice',
	'delivery_late'
] as const satisfies readonly MailKind[];

export interface RenderedMail {
	subject: string;
	html: string;
	text: string;
}

export interface MailShop {
	/** The name the shop signs with, e.g. "Mossback Hollow Inverts". */
	shopName: string;
}

// Hatchlot's tokens (tailwind.config.ts), repeated here because mail cannot load them.
const look = {
	page: '#faf7f0',
	paper: '#fdfcf8',
	rule: '#e6ddcb',
	ink: '#24221d',
	muted: '#6b6558',
	moss: '#2f5227',
	loam: '#6c533b',
	font: "'Source Sans 3', 'Source Sans Pro', -apple-system, BlinkMacSystemFont, 'Segoe UI', Roboto, Helvetica, Arial, sans-serif"
} as const;

const HTML_ESCAPES: Record<string, string> = {
	'&': '&amp;',
	'<': '&lt;',
	'>': '&gt;',
	'"': '&quot;',
	"'": '&#39;'
};

/** Text made safe for HTML content and quoted attribute values. */
export function escapeHtml(value: string): string {
	return value.replace(/[&<>"']/g, (character) => HTML_ESCAPES[character] ?? character);
}

/** One line of display text: no line breaks or control characters from a stored name. */
function oneLine(value: string): string {
	// eslint-disable-next-line no-control-regex -- stripping control characters is the point
	return value.replace(/[\u0000-\u001f\u007f\s]+/g, ' ').trim();
}

/** Only web links go into a button: a javascript: or data: address would be a trap. */
export function checkedLink(url: string): string {
	let parsed: URL;
	try {
		parsed = new URL(url);
	} catch {
		throw new RangeError(`not an absolute link: ${url}`);
	}
	if (parsed.protocol !== 'https:' && parsed.protocol !== 'http:') {
		throw new RangeError(`links in shop mail must be http(s), got ${parsed.protocol}`);
	}
	return parsed.href;
}

/** "15 minutes", "1 hour", "24 hours", "2 days", "90 minutes". */
export function formatLifetime(minutes: number): string {
	if (!Number.isInteger(minutes) || minutes <= 0) {
		throw new RangeError(`a link lifetime is a whole number of minutes above 0, got ${minutes}`);
	}
	const plural = (count: number, unit: string) => `${count} ${unit}${count === 1 ? '' : 's'}`;
	if (minutes % 1440 === 0 && minutes > 1440) return plural(minutes / 1440, 'day');
	if (minutes % 60 === 0) return plural(minutes / 60, 'hour');
	return plural(minutes, 'minute');
}

/**
 * A paragraph of the body; `strong` parts are bold in HTML and plain in text; a `link`
 * part is an anchor in HTML and its words followed by the address in text.
 */
type Paragraph = (string | { strong: string } | { link: string; url: string })[];

interface Letter {
	subject: string;
	/** Shown by inboxes beside the subject; never shown in the opened mail. */
	preview: string;
	greeting: string;
	before: Paragraph[];
	button?: { label: string; url: string };
	after: Paragraph[];
	/** Small print at the foot: why the reader got this. */
	footnote: string;
}

function paragraphHtml(paragraph: Paragraph): string {
	return paragraph
		.map((part) => {
			if (typeof part === 'string') return escapeHtml(part);
			if ('link' in part)
				return `<a href="${escapeHtml(checkedLink(part.url))}" style="color:${look.moss};">${escapeHtml(part.link)}</a>`;
			return `<strong style="font-weight:700;color:${look.ink};">${escapeHtml(part.strong)}</strong>`;
		})
		.join('');
}

function paragraphText(paragraph: Paragraph): string {
	return paragraph
		.map((part) => {
			if (typeof part === 'string') return part;
			if ('link' in part) return `${part.link}: ${checkedLink(part.url)}`;
			return part.strong;
		})
		.join('');
}

function renderLetter(letter: Letter, shopName: string): RenderedMail {
	const shop = escapeHtml(shopName);
	const p = (paragraph: Paragraph) =>
		`<p style="margin:0 0 16px;font-size:17px;line-height:1.65;color:${look.ink};">${paragraphHtml(paragraph)}</p>`;
	const button = letter.button
		? `<table role="presentation" cellpadding="0" cellspacing="0" border="0" style="margin:8px 0 24px;">
<tr><td style="border-radius:6px;background-color:${look.moss};">
<a href="${escapeHtml(letter.button.url)}" style="display:inline-block;padding:13px 24px;font-family:${escapeHtml(look.font)};font-size:17px;font-weight:700;line-height:1.2;color:#ffffff;text-decoration:none;border-radius:6px;border:1px solid ${look.moss};">${escapeHtml(letter.button.label)}</a>
</td></tr></table>
<p style="margin:0 0 16px;font-size:14px;line-height:1.5;color:${look.muted};">If the button does not open, copy this address into your browser:<br><a href="${escapeHtml(letter.button.url)}" style="color:${look.moss};word-break:break-all;">${escapeHtml(letter.button.url)}</a></p>`
		: '';

	const html = `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="color-scheme" content="light">
<title>${escapeHtml(letter.subject)}</title>
</head>
<body style="margin:0;padding:0;background-color:${look.page};">
<div style="display:none;max-height:0;overflow:hidden;opacity:0;">${escapeHtml(letter.preview)}</div>
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="background-color:${look.page};">
<tr><td align="center" style="padding:24px 12px;">
<table role="presentation" width="100%" cellpadding="0" cellspacing="0" border="0" style="max-width:560px;font-family:${escapeHtml(look.font)};">
<tr><td style="padding:0 4px 12px;font-size:13px;font-weight:700;letter-spacing:0.06em;text-transform:uppercase;color:${look.loam};">${shop}</td></tr>
<tr><td style="background-color:${look.paper};border:1px solid ${look.rule};border-top:4px solid ${look.moss};border-radius:8px;padding:28px 24px 12px;">
<p style="margin:0 0 16px;font-size:17px;line-height:1.65;color:${look.ink};">${escapeHtml(letter.greeting)}</p>
${letter.before.map(p).join('\n')}
${button}
${letter.after.map(p).join('\n')}
<p style="margin:0 0 16px;font-size:17px;line-height:1.65;color:${look.ink};">— ${shop}</p>
</td></tr>
<tr><td style="padding:16px 4px;font-size:13px;line-height:1.5;color:${look.muted};">${escapeHtml(letter.footnote)}</td></tr>
</table>
</td></tr>
</table>
</body>
</html>
`;

	const lines = [
		letter.greeting,
		'',
		...letter.before.flatMap((paragraph) => [paragraphText(paragraph), '']),
		...(letter.button ? [`${letter.button.label}:`, letter.button.url, ''] : []),
		...letter.after.flatMap((paragraph) => [paragraphText(paragraph), '']),
		`— ${shopName}`,
		'',
		'--',
		letter.footnote,
		''
	];
	return { subject: letter.subject, html, text: lines.join('\n') };
}

/** "Tue, Dec 8, 2026". Calendar dates carry no zone; 'UTC' only tells the formatter not to shift the day. */
function calendarDay(date: string): string {
	return formatShopDate(date, 'UTC');
}

const SERVICE_WORDS: Record<'overnight' | 'two_day', string> = {
	overnight: 'overnight',
	two_day: 'two-day'
};

/** A hold can name many ruled-out days; the mail names the first few and counts the rest. */
export const LOST_DATE_REASONS_SHOWN = 4;

function cautionParagraphs(): Paragraph[] {
	return shippingCautions.map((caution) => [{ strong: `${caution.title}.` }, ` ${caution.text}`]);
}

/** The notes that go with any live animal the shop offers: the guarantee and the buyer's state rules. */
function arrivalAndStateParagraphs(): Paragraph[] {
	return shippingCautions
		.filter((caution) => /live-arrival|rules/i.test(caution.title))
		.map((caution) => [{ strong: `${caution.title}.` }, ` ${caution.text}`]);
}

/** What to do when the box comes, each step a paragraph with its title in bold. */
function arrivalParagraphs(claimWindowHours: number): Paragraph[] {
	return arrivalSteps(claimWindowHours).map((step) => [
		{ strong: `${step.title}.` },
		` ${step.text}`
	]);
}

/** The buyer's own local rules come first; said with every box of live animals. */
function stateRulesParagraphs(): Paragraph[] {
	return shippingCautions
		.filter((caution) => /rules/i.test(caution.title))
		.map((caution) => [{ strong: `${caution.title}.` }, ` ${caution.text}`]);
}

/** "Tracking number: 1Z… (follow it on UPS's site)", or nothing for hand delivery. */
function trackingParagraphs(message: {
	carrier: Carrier;
	trackingNumber: string | null;
	trackingUrl: string | null;
}): Paragraph[] {
	if (message.carrier === 'hand' || !message.trackingNumber) return [];
	const number = oneLine(message.trackingNumber);
	const carrier = carrierLabels[message.carrier];
	return [
		message.trackingUrl
			? [
					`${carrier} tracking number: `,
					{ strong: number },
					' (',
					{ link: `follow it on the ${carrier} site`, url: message.trackingUrl },
					').'
				]
			: [`${carrier} tracking number: `, { strong: number }, '.']
	];
}

/** "Desert millipede (Orthoporus ornatus)", or the scientific name alone when that is all there is. */
function speciesWords(commonName: string, scientificName: string): string {
	const common = oneLine(commonName);
	const scientific = oneLine(scientificName);
	return common ? `${common} (${scientific})` : scientific;
}

function hello(name: string | null): string {
	const clean = name ? oneLine(name) : '';
	return clean ? `Hello ${clean},` : 'Hello,';
}

/** Renders one message with the shop's name. Throws RangeError on a link that is not http(s). */
export function renderMail(message: MailMessage, shop: MailShop): RenderedMail {
	const shopName = oneLine(shop.shopName) || 'Hatchlot shop';
	const sentTo = `This e-mail was sent to ${oneLine(message.to)} by ${shopName}.`;
	switch (message.kind) {
		case 'verify_email': {
			const lifetime = formatLifetime(message.expiresInMinutes);
			return renderLetter(
				{
					subject: `Confirm your e-mail address for ${shopName}`,
					preview: `One click confirms this address for your ${shopName} account.`,
					greeting: hello(message.name),
					before: [
						[
							`Thank you for opening an account with ${shopName}. Please confirm that this address is yours, so order updates, ship dates and care sheets reach you.`
						]
					],
					button: { label: 'Confirm my e-mail address', url: checkedLink(message.url) },
					after: [
						['The link works once and expires in ', { strong: lifetime }, '.'],
						[
							'If you did not open an account, you can ignore this message: the address stays unconfirmed and nothing is sent to it again.'
						]
					],
					footnote: `${sentTo} You get it because someone signed up with this address.`
				},
				shopName
			);
		}
		case 'sign_in_link': {
			const lifetime = formatLifetime(message.expiresInMinutes);
			return renderLetter(
				{
					subject: `Your sign-in link for ${shopName}`,
					preview: `Sign in to ${shopName} without a password. The link expires in ${lifetime}.`,
					greeting: hello(null),
					before: [['Here is the link you asked for. It signs you in; no password needed.']],
					button: { label: `Sign in to ${shopName}`, url: checkedLink(message.url) },
					after: [
						['The link works once and expires in ', { strong: lifetime }, '.'],
						[
							'If you did not ask to sign in, ignore this message. Nobody can sign in without the link, and it stops working on its own.'
						]
					],
					footnote: `${sentTo} You get it because a sign-in link was asked for on the shop's sign-in page.`
				},
				shopName
			);
		}
		case 'password_reset': {
			const lifetime = formatLifetime(message.expiresInMinutes);
			return renderLetter(
				{
					subject: `Choose a new password for ${shopName}`,
					preview: `A link to choose a new password. It expires in ${lifetime}.`,
					greeting: hello(message.name),
					before: [
						[
							`A new password was asked for on your ${shopName} account. Use the button to choose one.`
						]
					],
					button: { label: 'Choose a new password', url: checkedLink(message.url) },
					after: [
						['The link works once and expires in ', { strong: lifetime }, '.'],
						[
							'Your current password keeps working until you choose a new one. If you did not ask for this, ignore this message.'
						]
					],
					footnote: `${sentTo} You get it because a password reset was asked for with this address.`
				},
				shopName
			);
		}
		case 'account_exists': {
			const lifetime = formatLifetime(message.expiresInMinutes);
			return renderLetter(
				{
					subject: `You already have an account at ${shopName}`,
					preview: 'Someone tried to sign up with this address. Your account is unchanged.',
					greeting: hello(null),
					before: [
						[
							'Someone just tried to open a new account with this e-mail address, but there is already an account for it. You can sign in as you always do.'
						],
						['Forgotten the password? Choose a new one here:']
					],
					button: { label: 'Choose a new password', url: checkedLink(message.url) },
					after: [
						['The link works once and expires in ', { strong: lifetime }, '.'],
						['If it was not you, ignore this message: nothing about your account has changed.']
					],
					footnote: `${sentTo} You get it because someone signed up with this address.`
				},
				shopName
			);
		}
		case 'password_changed':
			return renderLetter(
				{
					subject: `Your ${shopName} password was changed`,
					preview: 'The password of your account was just changed.',
					greeting: hello(message.name),
					before: [
						['The password of your ', { strong: shopName }, ' account was just changed.'],
						['If that was you, there is nothing more to do.']
					],
					after: [
						[
							'If it was not you, choose a new password at once with "Forgot your password?" on the sign-in page, and reply to this message so the shop can check your orders with you.'
						]
					],
					footnote: `${sentTo} You get it whenever the password of your account changes.`
				},
				shopName
			);
		case 'ship_date_set': {
			const order = oneLine(message.orderNumber);
			const shipOn = calendarDay(message.shipDate);
			const arrives = calendarDay(message.deliveryDate);
			const service = SERVICE_WORDS[message.service];
			const opening: Paragraph = message.previousShipDate
				? [
						'The ship date of your order ',
						{ strong: order },
						` has moved from ${calendarDay(message.previousShipDate)} to ${shipOn}: the forecast changed, and that is the first day it is safe for the animals to travel.`
					]
				: [
						'Good news: the weather on the route has settled, and your order ',
						{ strong: order },
						' has a ship date.'
					];
			const packing: Paragraph[] = [];
			if (message.packs.includes('heat'))
				packing.push([
					'The box goes out with a heat pack, because the forecast on the route is cool.'
				]);
			if (message.packs.includes('cold'))
				packing.push([
					'The box goes out with a cold pack, because the forecast on the route is hot.'
				]);
			if (message.facilityPickup)
				packing.push([
					'The forecast where you are is close to the limit on the delivery day, so please have the box held at a staffed carrier facility for pickup rather than left at the door, and ',
					{ strong: 'collect it that same day' },
					'.'
				]);
			return renderLetter(
				{
					subject: message.previousShipDate
						? `New ship date for your ${shopName} order ${order}: ${shipOn}`
						: `Your ${shopName} order ${order} ships ${shipOn}`,
					preview: `It ships ${shipOn} by ${service} service and should arrive ${arrives}.`,
					greeting: hello(message.name),
					before: [
						opening,
						[
							'It ships on ',
							{ strong: shipOn },
							` by ${service} service and should arrive on `,
							{ strong: arrives },
							'.'
						],
						...packing
					],
					after: [
						[
							'Please plan to be there, or to collect the box, on the delivery day, and open it soon after it comes.'
						],
						...cautionParagraphs()
					],
					footnote: `${sentTo} You get it because the ship date of your order was set or changed.`
				},
				shopName
			);
		}
		case 'ship_date_lost': {
			const order = oneLine(message.orderNumber);
			const was = calendarDay(message.previousShipDate);
			const reasons = message.reasons.map(oneLine).filter((reason) => reason.length > 0);
			const shown = reasons.slice(0, LOST_DATE_REASONS_SHOWN);
			const more = reasons.length - shown.length;
			const forecast: Paragraph[] =
				message.heldBy === 'forecast' && shown.length > 0
					? [
							['What the forecast says:'],
							...shown.map((reason): Paragraph => [`– ${reason}`]),
							...(more > 0
								? [[`– and ${more} more ${more === 1 ? 'reading' : 'readings'} like these.`]]
								: [])
						]
					: [['The forecast on the route is outside what the animals can travel in.']];
			return renderLetter(
				{
					subject: `Your ${shopName} order ${order} is waiting for safe weather`,
					preview: `It will not ship on ${was}. You get an e-mail as soon as a new date is set.`,
					greeting: hello(message.name),
					before: [
						message.heldBy === 'forecast'
							? [
									'Your order ',
									{ strong: order },
									` was due to ship on ${was}, but the latest forecast rules that out, so it is on hold: a live animal is never sent into weather it may not survive.`
								]
							: [
									'Your order ',
									{ strong: order },
									` was due to ship on ${was}, but the shop has put it on hold to keep the animals safe.`
								],
						...(message.heldBy === 'forecast' ? forecast : [])
					],
					after: [
						[
							'What happens next: the animals stay in our care, and the order is checked again every morning. As soon as a safe ship date is set, you get an e-mail with it. There is nothing you need to do.'
						],
						['Questions? Reply to this message.']
					],
					footnote: `${sentTo} You get it because the ship date of your order was withdrawn.`
				},
				shopName
			);
		}
		case 'waitlist_confirm': {
			const species = speciesWords(message.commonName, message.scientificName);
			const lifetime = formatLifetime(message.expiresInMinutes);
			return renderLetter(
				{
					subject: `Confirm your place on the ${shopName} waitlist for ${oneLine(message.commonName) || oneLine(message.scientificName)}`,
					preview: `One click, and ${shopName} tells you when it has ${species} ready.`,
					greeting: hello(null),
					before: [
						[
							`Someone asked ${shopName} to say when it has `,
							{ strong: species },
							' ready, and gave this address. If that was you, confirm it with the button.'
						]
					],
					button: { label: 'Confirm my place on the waitlist', url: checkedLink(message.url) },
					after: [
						[
							'The button opens a page where you confirm with one more click. The link works once and expires in ',
							{ strong: lifetime },
							'.'
						],
						[
							'Once you are on the list you get one e-mail, in the order people joined, when a listing of this species goes live. Nothing else is sent.'
						],
						[
							'If it was not you, ignore this message: the address is not added without a click. Or ',
							{ link: 'take it off this waitlist now', url: message.leaveUrl },
							'.'
						]
					],
					footnote: `${sentTo} You get it because this address was given on the shop's waitlist page.`
				},
				shopName
			);
		}
		case 'waitlist_ready': {
			const species = speciesWords(message.commonName, message.scientificName);
			const title = oneLine(message.listingTitle);
			const price = formatCents(message.priceFromCents);
			return renderLetter(
				{
					subject: `Ready now at ${shopName}: ${oneLine(message.commonName) || oneLine(message.scientificName)}`,
					preview: `${title}, from ${price} an animal. You asked to hear first.`,
					greeting: hello(message.name),
					before: [
						[
							'You asked to hear when we had ',
							{ strong: species },
							' ready. A listing is live now:'
						],
						[{ strong: title }, `, from ${price} an animal.`],
						[
							'Stock is limited and sells in the order carts reach checkout; this e-mail does not hold any for you.'
						]
					],
					button: { label: 'See the listing', url: checkedLink(message.listingUrl) },
					after: [
						...arrivalAndStateParagraphs(),
						[
							'This is the only e-mail this waitlist sends you; to hear about a later clutch, join again from the species page. ',
							{ link: 'Leave this waitlist', url: message.leaveUrl },
							'.'
						]
					],
					footnote: `${sentTo} You get it because this address joined the waitlist for ${species}.`
				},
				shopName
			);
		}
		case 'order_receipt': {
			const order = oneLine(message.orderNumber);
			const total = formatCents(message.totalCents);
			const lines: Paragraph[] = message.lines.map((line) => [
				`${line.quantity} × ${oneLine(line.description)}: `,
				{ strong: formatCents(line.lineTotalCents) }
			]);
			const live: Paragraph[] = message.hasLive
				? [
						...arrivalAndStateParagraphs(),
						[
							{ strong: 'Care sheet.' },
							' The care sheet for each species is on its page in the shop; please read it and set up the enclosure before the box arrives.'
						]
					]
				: [];
			return renderLetter(
				{
					subject: `Receipt for your ${shopName} order ${order}: ${total}`,
					preview: `We have your payment of ${total}. The ship date follows the forecast.`,
					greeting: hello(message.name),
					before: [
						['Thank you: we have your payment for order ', { strong: order }, '.'],
						...lines,
						[
							`Subtotal ${formatCents(message.subtotalCents)}, ${SERVICE_WORDS[message.service]} shipping ${formatCents(message.shippingCents)}, `,
							{ strong: `total paid ${total}` },
							'.'
						],
						[
							'Live animals ship only on a day the forecast on the route is safe; we e-mail you the ship date as soon as it is set.'
						]
					],
					button: { label: 'See your order', url: checkedLink(message.orderUrl) },
					after: live,
					footnote: `${sentTo} You get it because you paid for this order.`
				},
				shopName
			);
		}
		case 'refund_issued': {
			const order = oneLine(message.orderNumber);
			const amount = formatCents(message.amountCents);
			const lines: Paragraph[] = message.lines.map((line) => [
				`${line.quantity} × ${oneLine(line.description)}`
			]);
			return renderLetter(
				{
					subject: `${shopName} sent back ${amount} for order ${order}`,
					preview: `${amount} is on its way back to the card you paid with.`,
					greeting: hello(message.name),
					before: [
						...(message.forClaim
							? [
									[
										'We have looked at your claim on order ',
										{ strong: order },
										' and are refunding the animals that arrived dead. We are sorry they did not make it.'
									] satisfies Paragraph
								]
							: []),
						[
							'We have sent ',
							{ strong: amount },
							' back to the card you paid order ',
							{ strong: order },
							' with.'
						],
						['What it is for: ', oneLine(message.reason)],
						...lines,
						message.remainingCents > 0
							? [`The rest of the order stands: ${formatCents(message.remainingCents)} stays paid.`]
							: ['That is everything you paid for this order.'],
						[
							'Card issuers usually take five to ten business days to show a refund on the statement; the date depends on your bank, not on us.'
						]
					],
					after: [],
					footnote: `${sentTo} You get it because you paid for this order.`
				},
				shopName
			);
		}
		case 'refund_failed': {
			const order = oneLine(message.orderNumber);
			const amount = formatCents(message.amountCents);
			return renderLetter(
				{
					subject: `${shopName}: refund of ${amount} on ${order} did not go through`,
					preview: `Stripe reports refund ${oneLine(message.stripeRefundId)} failed; the amount counts as paid again.`,
					greeting: 'Hello,',
					before: [
						[
							'Stripe reports that refund ',
							{ strong: oneLine(message.stripeRefundId) },
							' of ',
							{ strong: amount },
							' on order ',
							{ strong: order },
							' failed, so the buyer did not get the money back.'
						],
						[
							'The amount counts as paid on the order again and the order is back where it was before the refund. Please check the card with Stripe and refund again, or reach the buyer another way.'
						]
					],
					button: { label: 'Open the order', url: checkedLink(message.orderUrl) },
					after: [],
					footnote: `${sentTo} You get it because you are an admin of this shop.`
				},
				shopName
			);
		}
		case 'claim_received': {
			const order = oneLine(message.orderNumber);
			const lines: Paragraph[] = message.lines.map((line) => [
				`${line.deadCount} dead: ${oneLine(line.description)}`
			]);
			const photos = message.photoCount === 1 ? '1 photo' : `${message.photoCount} photos`;
			return renderLetter(
				{
					subject: `${shopName} has your claim on order ${order}`,
					preview: 'We have your report and photos; the shop decides and e-mails you.',
					greeting: hello(message.name),
					before: [
						[
							'We are sorry some of your animals arrived dead. We have your claim on order ',
							{ strong: order },
							` with ${photos}:`
						],
						...lines,
						[
							'The shop looks at every claim itself and decides between a refund for the animals that died and sending them again. We e-mail you the decision; you can follow it on your order page.'
						],
						[
							'Shipping is not refunded under the live-arrival guarantee. Please keep the box and the animals for a few days in case we ask a question.'
						]
					],
					button: { label: 'See your order', url: checkedLink(message.orderUrl) },
					after: [],
					footnote: `${sentTo} You get it because you filed a claim on this order.`
				},
				shopName
			);
		}
		case 'claim_filed': {
			const order = oneLine(message.orderNumber);
			const animals = message.deadCount === 1 ? '1 animal' : `${message.deadCount} animals`;
			return renderLetter(
				{
					subject: `${shopName}: a DOA claim on ${order} waits for you`,
					preview: `${oneLine(message.customer)} reports ${animals} dead on arrival.`,
					greeting: 'Hello,',
					before: [
						[
							{ strong: oneLine(message.customer) },
							' filed a dead-on-arrival claim on order ',
							{ strong: order },
							` for ${animals}, with photos.`
						],
						[
							'Look at the photos, the ship check and the weather on the delivery day, then refund, send again or decline with a reason.'
						]
					],
					button: { label: 'Open the claim', url: checkedLink(message.claimUrl) },
					after: [],
					footnote: `${sentTo} You get it because you are an admin of this shop.`
				},
				shopName
			);
		}
		case 'claim_decided': {
			const order = oneLine(message.orderNumber);
			const note = oneLine(message.note);
			const before: Paragraph[] =
				message.outcome === 'reship'
					? [
							[
								'We have looked at your claim on order ',
								{ strong: order },
								' and will send the animals that arrived dead again, at no charge',
								message.reshipOrderNumber
									? `, as order ${oneLine(message.reshipOrderNumber)}.`
									: '.'
							],
							...(note ? [['From the shop: ', note] satisfies Paragraph] : []),
							[
								'It ships on the first day the forecast on the route is safe, like any order; we e-mail you the ship date once it is set.'
							]
						]
					: [
							[
								'We have looked at your claim on order ',
								{ strong: order },
								' and cannot accept it.'
							],
							['Why: ', note],
							[
								'If you think we have this wrong, reply to this e-mail with what we missed and we will look again.'
							]
						];
			return renderLetter(
				{
					subject:
						message.outcome === 'reship'
							? `${shopName} will send your animals again (order ${order})`
							: `${shopName} declined your claim on order ${order}`,
					preview:
						message.outcome === 'reship'
							? 'A no-charge order replaces the animals that arrived dead.'
							: note,
					greeting: hello(message.name),
					before,
					button: { label: 'See your order', url: checkedLink(message.orderUrl) },
					after: [],
					footnote: `${sentTo} You get it because you filed a claim on this order.`
				},
				shopName
			);
		}
		case 'ship_notice': {
			const order = oneLine(message.orderNumber);
			const left = calendarDay(message.shippedOn);
			const arrives = calendarDay(message.expectedDeliveryOn);
			const byHand = message.carrier === 'hand';
			const how = byHand
				? [
						'Your order ',
						{ strong: order },
						` left the shop on ${left} to be handed over in person, on `,
						{ strong: arrives },
						'.'
					]
				: [
						'Your order ',
						{ strong: order },
						` left the shop on ${left} by ${carrierLabels[message.carrier]} ${SERVICE_WORDS[message.service]} service and should arrive on `,
						{ strong: arrives },
						'.'
					];
			const packing: Paragraph[] = [];
			if (message.packs.includes('heat'))
				packing.push(['It travels with a heat pack, because the forecast on the route is cool.']);
			if (message.packs.includes('cold'))
				packing.push(['It travels with a cold pack, because the forecast on the route is hot.']);
			if (message.facilityPickup && !byHand)
				packing.push([
					'The forecast where you are is close to the limit on the delivery day, so please have the box held at a staffed carrier facility for pickup rather than left at the door, and ',
					{ strong: 'collect it that same day' },
					'.'
				]);
			const onArrival: Paragraph[] = message.hasLive
				? [
						['When the box comes:'],
						...arrivalParagraphs(message.claimWindowHours),
						...stateRulesParagraphs()
					]
				: [['When the box comes, open it and check everything is there.']];
			return renderLetter(
				{
					subject: byHand
						? `Your ${shopName} order ${order} is on its way by hand`
						: `Your ${shopName} order ${order} has shipped`,
					preview: byHand
						? `It is handed over in person on ${arrives}.`
						: `It left on ${left} by ${carrierLabels[message.carrier]} and should arrive ${arrives}.`,
					greeting: hello(message.name),
					before: [
						how,
						...trackingParagraphs(message),
						...packing,
						...(message.hasLive
							? [
									[
										'Please be there, or collect the box, on the delivery day: live animals should not wait in the box longer than they must.'
									] satisfies Paragraph
								]
							: [])
					],
					button: { label: 'See your order', url: checkedLink(message.orderUrl) },
					after: onArrival,
					footnote: `${sentTo} You get it because your order has left the shop.`
				},
				shopName
			);
		}
		case 'delivery_late': {
			const order = oneLine(message.orderNumber);
			const due = calendarDay(message.expectedDeliveryOn);
			return renderLetter(
				{
					subject: `Your ${shopName} order ${order} is running late`,
					preview: `It was due on ${due} and is not reported delivered yet. Here is what to do.`,
					greeting: hello(message.name),
					before: [
						[
							'Your order ',
							{ strong: order },
							` was due to arrive on ${due}, and it has not been reported delivered yet. A box is sometimes held up for a day; we are following it too.`
						],
						...trackingParagraphs(message),
						['What to do now:'],
						[
							'– Follow the tracking for the latest scan, and keep an eye out for a delivery notice.'
						],
						[
							'– If the carrier holds the box at a facility, collect it the same day: the animals are safest out of the box and indoors.'
						],
						[
							'– Please do not have it sent to another address: a redirected box is outside the live-arrival guarantee. Reply to this e-mail first and we will sort it out with you.'
						]
					],
					button: { label: 'See your order', url: checkedLink(message.orderUrl) },
					after: [
						...(message.hasLive
							? [
									['When the box comes:'] satisfies Paragraph,
									...arrivalParagraphs(message.claimWindowHours)
								]
							: [
									['When the box comes, open it and check everything is there.'] satisfies Paragraph
								]),
						[
							'Reply to this e-mail if the tracking shows a problem, or if the box has still not come tomorrow.'
						]
					],
					footnote: `${sentTo} You get it because your box is later than the carrier's expected day.`
				},
				shopName
			);
		}
	}
}
