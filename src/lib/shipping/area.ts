// Where live animals can go: the contiguous United States and DC. Alaska, Hawaii, the
// territories and military post offices are beyond reliable overnight or two-day ground
// transit for live animals, so the shop does not ship there. Pure.
import { US_STATES } from '$lib/accounts/schemas';

const BEYOND_GROUND_TRANSIT = new Set(['AK', 'HI']);

/** USPS codes of the 48 contiguous states and the District of Columbia. */
export const SHIPPING_AREA_STATES: ReadonlySet<string> = new Set(
	US_STATES.filter((state) => !BEYOND_GROUND_TRANSIT.has(state))
);

/** Why a place (by its USPS state code) is outside the shipping area, or null. */
export function shippingAreaProblem(zip: string, state: string): string | null {
	if (SHIPPING_AREA_STATES.has(state)) return null;
	return `ZIP code ${zip} is in ${state}, outside our shipping area: live animals go only to the contiguous United States and DC.`;
}
