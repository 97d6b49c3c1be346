// How long after delivery a claim came in, in words the owner reads at a glance.
// Pure: instants in, numbers and text out.

const MS_PER_HOUR = 3_600_000;

/** Hours from `from` to `to`, fractional; negative when `to` is earlier. */
export function hoursBetween(from: Date, to: Date): number {
	return (to.getTime() - from.getTime()) / MS_PER_HOUR;
}

/** "40 min", "1 h 10 min", "2 h", "1 day 3 h": rounded to the minute. */
export function formatDuration(hours: number): string {
	const minutes = Math.round(Math.abs(hours) * 60);
	if (minutes < 60) return `${minutes} min`;
	const wholeHours = Math.floor(minutes / 60);
	const restMinutes = minutes % 60;
	if (wholeHours < 24)
		return restMinutes ? `${wholeHours} h ${restMinutes} min` : `${wholeHours} h`;
	const days = Math.floor(wholeHours / 24);
	const restHours = wholeHours % 24;
	const dayWords = `${days} ${days === 1 ? 'day' : 'days'}`;
	return restHours ? `${dayWords} ${restHours} h` : dayWords;
}

/** "40 min after delivery", or before it when the delivery time was moved later. */
export function describeFiledAfter(hours: number): string {
	return hours < 0
		? `${formatDuration(hours)} before the recorded delivery`
		: `${formatDuration(hours)} after delivery`;
}
