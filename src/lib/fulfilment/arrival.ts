// What the buyer does when the box comes, in the order it is done: the words of the ship
// notice and the late-delivery mail (and for any printed slip that wants them). The
// room-temperature band and the guarantee's terms are the trade's common practice as the
// product states them; the buyer's own local rules come first. Plain data, relative
// imports only, so the mail templates can use it outside SvelteKit.
import { roundedCelsius } from '../format/temperature';

export type ArrivalStep = { title: string; text: string };

/** The low to high 70s °F: comfortable room temperature, ideal for most of these animals. */
export const ROOM_TEMPERATURE_F = { low: 70, high: 79 } as const;

/** "70–79 °F (21–26 °C)". */
export function roomTemperatureWords(): string {
	const { low, high } = ROOM_TEMPERATURE_F;
	return `${low}–${high} °F (${roundedCelsius(low)}–${roundedCelsius(high)} °C)`;
}

function hoursWords(hours: number): string {
	return hours === 1 ? '1 hour' : `${hours} hours`;
}

/** The steps on arrival, with the shop's claim window in hours. */
export function arrivalSteps(claimWindowHours: number): ArrivalStep[] {
	if (!Number.isInteger(claimWindowHours) || claimWindowHours <= 0)
		throw new RangeError(`a claim window is whole hours above 0, got ${claimWindowHours}`);
	const window = hoursWords(claimWindowHours);
	return [
		{
			title: 'Open it at once',
			text: 'Take the box indoors and open it as soon as it comes. Do not leave it in the sun, in a car, or out in the cold, not even for a little while.'
		},
		{
			title: 'Keep it at room temperature',
			text: `Unpack in a comfortably warm room; ${roomTemperatureWords()} suits most of these animals. Take out any heat or cold pack as you unpack: its job ends when the box is open.`
		},
		{
			title: 'Check every animal',
			text: 'Look at each animal and count them against your order before you settle them into their enclosure.'
		},
		{
			title: 'If one is dead, photo first',
			text: 'Take a photo of the animals as they arrived, in the box, before you move anything. The live-arrival guarantee needs that photo.'
		},
		{
			title: `Claim within ${window}`,
			text: `Report dead animals on your order page within ${window} of delivery, with the photo. The guarantee covers a box accepted at the first delivery attempt and not redirected; shipping is not refunded.`
		},
		{
			title: 'Handle with care',
			text: 'Handle animals low, over a soft surface, and wash your hands after every handling: many millipedes release a defensive fluid that can stain and irritate skin.'
		}
	];
}
