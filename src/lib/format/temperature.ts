// Temperatures are kept in whole °F (how the trade and US forecasts speak);
// °C is derived for display only, never stored.

/** Exact conversion, unrounded: t/°C = (t/°F − 32)/1.8. */
export function fahrenheitToCelsius(fahrenheit: number): number {
	if (!Number.isFinite(fahrenheit)) {
		throw new RangeError(`not a temperature: ${String(fahrenheit)}`);
	}
	// ×5/9 rather than ÷1.8: 1.8 has no exact binary form, 5 and 9 do.
	return ((fahrenheit - 32) * 5) / 9;
}

/** Round half away from zero, and never show "-0". */
function roundWhole(value: number): number {
	const rounded = Math.sign(value) * Math.round(Math.abs(value));
	return rounded === 0 ? 0 : rounded;
}

/** A number as text with a true minus sign (U+2212), as SI and NIST SP 811 typeset it; never "-0". */
function signed(text: string): string {
	if (/^-0(\.0+)?$/.test(text)) return text.slice(1);
	return text.replace(/^-/, '\u2212');
}

/** °C rounded to the nearest whole degree, as shown beside a °F value. */
export function roundedCelsius(fahrenheit: number): number {
	return roundWhole(fahrenheitToCelsius(fahrenheit));
}

/** "72 °F": whole degrees stay whole, anything else to one decimal. */
export function formatFahrenheit(fahrenheit: number): string {
	const text = Number.isInteger(fahrenheit) ? String(fahrenheit) : fahrenheit.toFixed(1);
	return `${signed(text)} °F`;
}

/** "22 °C": the °F reading converted and rounded to the nearest degree. */
export function formatCelsiusOf(fahrenheit: number): string {
	return `${signed(String(roundedCelsius(fahrenheit)))} °C`;
}

/** "72 °F (22 °C)": °F as given, °C rounded to the nearest degree. */
export function formatTemperature(fahrenheit: number): string {
	return `${formatFahrenheit(fahrenheit)} (${formatCelsiusOf(fahrenheit)})`;
}

/** Why the °C beside a value may differ a little from a calculator. */
export function describeCelsiusRounding(fahrenheit: number): string {
	const exact = fahrenheitToCelsius(fahrenheit);
	const shown = formatCelsiusOf(fahrenheit);
	if (Math.abs(exact - roundedCelsius(fahrenheit)) < 1e-9) {
		return `${formatFahrenheit(fahrenheit)} is exactly ${shown}`;
	}
	const exactText = signed((Math.round(exact * 10) / 10).toFixed(1));
	return `${formatFahrenheit(fahrenheit)} is ${exactText} °C, shown rounded to ${shown}`;
}
