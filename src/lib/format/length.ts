// Enclosure sizes are entered in inches (numeric text from PostgreSQL, e.g. "12.0").

/** "12 in", "4.5 in"; accepts the exact decimal text the database hands over. */
export function formatInches(inches: number | string): string {
	const value = typeof inches === 'string' ? Number(inches.trim()) : inches;
	if (!Number.isFinite(value) || (typeof inches === 'string' && inches.trim() === '')) {
		throw new RangeError(`not a length in inches: ${String(inches)}`);
	}
	// One decimal is the precision the schema keeps (numeric(5,1)); drop a trailing ".0".
	const text = (Math.round(value * 10) / 10).toFixed(1).replace(/\.0$/, '');
	return `${text === '-0' ? '0' : text} in`;
}
