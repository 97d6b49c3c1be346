// Money is integer cents everywhere; this is the one place cents become text.
// USD has two minor-unit digits (ISO 4217), so 100 cents make a dollar.

const USD_MINOR_UNIT = 2;
const CENTS_PER_DOLLAR = 10 ** USD_MINOR_UNIT;
const groupDollars = new Intl.NumberFormat('en-US', {
	useGrouping: true,
	maximumFractionDigits: 0
});

/** Integer cents to US dollars, e.g. 1400 → "$14.00", -250 → "-$2.50". */
export function formatCents(cents: number): string {
	// A fraction of a cent means a float slipped in upstream; refuse rather than round it away.
	if (!Number.isSafeInteger(cents)) {
		throw new RangeError(`formatCents needs a whole number of cents, got ${String(cents)}`);
	}
	const magnitude = Math.abs(cents);
	// Integer division keeps the digits exact; no cents/100 float on the way.
	const dollars = Math.floor(magnitude / CENTS_PER_DOLLAR);
	const minor = String(magnitude % CENTS_PER_DOLLAR).padStart(USD_MINOR_UNIT, '0');
	const sign = cents < 0 ? '-' : '';
	return `${sign}$${groupDollars.format(dollars)}.${minor}`;
}
