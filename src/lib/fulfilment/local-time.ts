// A time typed on the shop's clock (an <input type="datetime-local"> value) as the UTC
// instant it names, and back. Intl knows every zone's offsets, so no zone data of our own.
/** 'YYYY-MM-DDTHH:mm', as a datetime-local input sends it (seconds, when given, are dropped). */
const LOCAL_TIME = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::\d{2}(?:\.\d+)?)?$/;

type WallClock = { year: number; month: number; day: number; hour: number; minute: number };

const DAY_MS = 86_400_000;

const formatters = new Map<string, Intl.DateTimeFormat>();

function wallClockIn(instant: number, timeZone: string): WallClock {
	let format = formatters.get(timeZone);
	if (!format) {
		format = new Intl.DateTimeFormat('en-US', {
			timeZone,
			hourCycle: 'h23',
			year: 'numeric',
			month: '2-digit',
			day: '2-digit',
			hour: '2-digit',
			minute: '2-digit'
		});
		formatters.set(timeZone, format);
	}
	const parts: Record<string, number> = {};
	for (const part of format.formatToParts(new Date(instant)))
		if (part.type !== 'literal') parts[part.type] = Number(part.value);
	return {
		year: parts.year ?? 0,
		month: parts.month ?? 0,
		day: parts.day ?? 0,
		hour: parts.hour ?? 0,
		minute: parts.minute ?? 0
	};
}

const asUtc = (clock: WallClock) =>
	Date.UTC(clock.year, clock.month - 1, clock.day, clock.hour, clock.minute);

/** How far the zone's clock is ahead of UTC at `instant`, in milliseconds. */
function offsetAt(instant: number, timeZone: string): number {
	// Whole minutes: Intl shows no seconds, and no zone in use today has a seconds offset.
	const floored = instant - (((instant % 60_000) + 60_000) % 60_000);
	return asUtc(wallClockIn(floored, timeZone)) - floored;
}

/**
 * The instant a shop-clock time names, or null when the text is not a time or the time
 * does not exist there (skipped when the clocks go forward). A time that happens twice
 * (clocks going back) is the first of the two.
 */
export function instantFromShopTime(local: string, timeZone: string): Date | null {
	const match = LOCAL_TIME.exec(local.trim());
	if (!match) return null;
	const clock: WallClock = {
		year: Number(match[1]),
		month: Number(match[2]),
		day: Number(match[3]),
		hour: Number(match[4]),
		minute: Number(match[5])
	};
	if (clock.month < 1 || clock.month > 12 || clock.hour > 23 || clock.minute > 59) return null;
	const wall = asUtc(clock);
	if (new Date(wall).getUTCDate() !== clock.day) return null; // no such day, e.g. Feb 30
	// The zone's offsets a day either side: around a clock change they differ, and the
	// wall time belongs to whichever of them gives it back (both in the repeated hour).
	const candidates = [offsetAt(wall - DAY_MS, timeZone), offsetAt(wall + DAY_MS, timeZone)]
		.map((offset) => wall - offset)
		.filter((at) => asUtc(wallClockIn(at, timeZone)) === wall);
	if (candidates.length === 0) return null;
	return new Date(Math.min(...candidates));
}

/** The shop-clock time of an instant, as a datetime-local input shows it: 'YYYY-MM-DDTHH:mm'. */
export function shopTimeOf(instant: Date, timeZone: string): string {
	const clock = wallClockIn(instant.getTime(), timeZone);
	const two = (value: number) => String(value).padStart(2, '0');
	return `${clock.year}-${two(clock.month)}-${two(clock.day)}T${two(clock.hour)}:${two(clock.minute)}`;
}
