// The fake's hosted pay page: our own plain look (the shop's paper, moss and brick
// colours), clearly labelled as a local test page. A plain HTML form, so it works without
// JavaScript; a decline is shown beside the card field with a word and a shape.

export interface PayPageLine {
	name: string;
	quantity: number;
	amountTotal: number;
}

export interface PayPageModel {
	sessionId: string;
	status: 'open' | 'complete' | 'expired';
	currency: string;
	amountTotal: number;
	lines: PayPageLine[];
	cancelUrl: string | null;
	successUrl: string | null;
	card?: string;
	decline?: string;
}

export const escapeHtml = (text: string) =>
	text.replace(
		/[&<>"']/g,
		(char) =>
			({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[char] as string
	);

/** An amount in the currency's smallest unit, shown with the currency's own digits (ISO 4217, as Intl knows them). */
export function formatMinorUnits(amount: number, currency: string): string {
	const format = new Intl.NumberFormat('en-US', {
		style: 'currency',
		currency: currency.toUpperCase()
	});
	const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
	return format.format(amount / 10 ** digits);
}

const STYLE = `
*{box-sizing:border-box}
body{margin:0;background:#faf7f0;color:#24221d;font:16px/1.5 "Source Sans 3",system-ui,sans-serif}
main{max-width:32rem;margin:0 auto;padding:1.25rem}
.banner{background:#fdf6e4;color:#82520c;border:1px solid #e6b04a;border-radius:.5rem;padding:.5rem .75rem;font-weight:600}
.banner::before{content:"\\25B2  "}
h1{font-size:1.5rem;margin:1rem 0 .25rem}
table{width:100%;border-collapse:collapse;margin:1rem 0;background:#fdfcf8;border:1px solid #e6ddcb}
td{padding:.5rem .75rem;border-top:1px solid #e6ddcb}
td.amount{text-align:right;white-space:nowrap}
tr.total td{font-weight:700;border-top:2px solid #d5c8b0}
label{display:block;font-weight:600;margin-top:1rem}
input{width:100%;font:inherit;font-size:1.125rem;padding:.625rem .75rem;border:1px solid #8f887a;border-radius:.375rem;background:#fff;letter-spacing:.05em}
input:focus{outline:3px solid #4e7a3f;outline-offset:1px}
input[aria-invalid=true]{border-color:#a4402b}
.hint{color:#6b6558;font-size:.9375rem;margin:.25rem 0 0}
.refusal{color:#7f3121;background:#fbefeb;border:1px solid #e9ae9e;border-radius:.375rem;padding:.5rem .75rem;margin:.5rem 0 0;font-weight:600}
.refusal::before{content:"\\2716  "}
.done{color:#2f5227;background:#eff4eb;border:1px solid #b9d0aa;border-radius:.375rem;padding:.5rem .75rem;font-weight:600}
button{margin-top:1rem;width:100%;font:inherit;font-weight:700;font-size:1.125rem;padding:.75rem;border:0;border-radius:.375rem;background:#2f5227;color:#fff;cursor:pointer}
button:hover{background:#243f1e}
button:focus-visible,a:focus-visible{outline:3px solid #4e7a3f;outline-offset:2px}
a{color:#55412f}
.back{display:inline-block;margin-top:1rem;padding:.5rem 0}
details{margin-top:1.5rem;color:#524d42}
code{font-size:.9375rem}
`;

function page(title: string, body: string): string {
	return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex">
<title>${escapeHtml(title)}</title>
<style>${STYLE}</style>
</head>
<body>
<main>
<p class="banner" role="note">Local test payment page: no card is charged and no money moves.</p>
${body}
</main>
</body>
</html>`;
}

export function payPageHtml(model: PayPageModel): string {
	const total = formatMinorUnits(model.amountTotal, model.currency);
	const back = model.cancelUrl
		? `<a class="back" href="${escapeHtml(model.cancelUrl)}">Back to the shop without paying</a>`
		: '';
	if (model.status === 'expired') {
		return page(
			'Payment page expired',
			`<h1>This payment page has expired</h1>
<p>Nothing was charged. Start checkout again from your cart.</p>${back}`
		);
	}
	if (model.status === 'complete') {
		const onward = model.successUrl
			? `<a class="back" href="${escapeHtml(model.successUrl.replaceAll('{CHECKOUT_SESSION_ID}', model.sessionId))}">Go to your order</a>`
			: '';
		return page(
			'Already paid',
			`<h1>Already paid</h1><p class="done">&#10004; This payment of ${escapeHtml(total)} is complete.</p>${onward}`
		);
	}
	const rows = model.lines
		.map(
			(line) =>
				`<tr><td>${escapeHtml(line.name)} &times; ${line.quantity}</td><td class="amount">${escapeHtml(formatMinorUnits(line.amountTotal, model.currency))}</td></tr>`
		)
		.join('');
	const refusal = model.decline
		? `<p class="refusal" id="card-error" role="alert">${escapeHtml(model.decline)}</p>`
		: '';
	return page(
		`Pay ${total}`,
		`<h1>Pay ${escapeHtml(total)}</h1>
<table><tbody>${rows}<tr class="total"><td>Total</td><td class="amount">${escapeHtml(total)}</td></tr></tbody></table>
<form method="post" action="/pay/${encodeURIComponent(model.sessionId)}">
<label for="card">Card number</label>
<input id="card" name="card" inputmode="numeric" autocomplete="cc-number" required
 value="${escapeHtml(model.card ?? '')}"${model.decline ? ' aria-invalid="true" aria-describedby="card-error card-hint"' : ' aria-describedby="card-hint"'}>
${refusal}
<p class="hint" id="card-hint">Use one of Stripe's test card numbers below.</p>
<button type="submit">${model.decline ? 'Try again' : 'Pay'} ${escapeHtml(total)}</button>
</form>
${back}
<details><summary>Test card numbers</summary>
<ul><li><code>4242 4242 4242 4242</code>: paid</li>
<li><code>4000 0000 0000 0002</code>: declined</li>
<li><code>4000 0000 0000 9995</code>: declined, insufficient funds</li></ul></details>`
	);
}

export function missingPageHtml(): string {
	return page(
		'No such payment',
		'<h1>No such payment</h1><p>This payment link is not known here.</p>'
	);
}
