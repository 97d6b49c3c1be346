// Where a box goes, by climate: NOAA NCEI's nine climatically consistent regions of the
// contiguous United States (Karl and Koss, 1984), keyed by USPS state code. The lists are
// written from memory of NCEI's published "U.S. Climate Regions" and compared with that
// page; the names are NCEI's plain-language ones. Pure.

export interface ClimateRegion {
	/** Stable key, used in report URLs and SQL. */
	key: string;
	/** NCEI's name for the region. */
	name: string;
	/** USPS codes of the states NCEI puts in it. */
	states: readonly string[];
}

/** The nine regions, roughly east to west (the order reports list them in). */
export const CLIMATE_REGIONS: readonly ClimateRegion[] = [
	{
		key: 'northeast',
		name: 'Northeast',
		// DC is in none of NCEI's lists; it lies inside Maryland's climate, so it goes here.
		states: ['CT', 'DE', 'ME', 'MD', 'MA', 'NH', 'NJ', 'NY', 'PA', 'RI', 'VT', 'DC']
	},
	{ key: 'southeast', name: 'Southeast', states: ['AL', 'FL', 'GA', 'NC', 'SC', 'VA'] },
	{
		key: 'ohio-valley',
		name: 'Ohio Valley',
		states: ['IL', 'IN', 'KY', 'MO', 'OH', 'TN', 'WV']
	},
	{ key: 'upper-midwest', name: 'Upper Midwest', states: ['IA', 'MI', 'MN', 'WI'] },
	{ key: 'south', name: 'South', states: ['AR', 'KS', 'LA', 'MS', 'OK', 'TX'] },
	{
		key: 'northern-rockies-plains',
		name: 'Northern Rockies and Plains',
		states: ['MT', 'NE', 'ND', 'SD', 'WY']
	},
	{ key: 'southwest', name: 'Southwest', states: ['AZ', 'CO', 'NM', 'UT'] },
	{ key: 'northwest', name: 'Northwest', states: ['ID', 'OR', 'WA'] },
	{ key: 'west', name: 'West', states: ['CA', 'NV'] }
];

/**
 * Alaska, Hawaii, the territories and military post: outside the nine regions. Live
 * animals do not go there, but a box of supplies may.
 */
export const OUTSIDE_REGIONS: Readonly<Pick<ClimateRegion, 'key' | 'name'>> = Object.freeze({
	key: 'outside',
	name: 'Outside the contiguous US'
});

const REGION_OF_STATE: ReadonlyMap<string, ClimateRegion> = new Map(
	CLIMATE_REGIONS.flatMap((region) => region.states.map((state) => [state, region] as const))
);

/** The climate region of a USPS state code (any case, padded or not); outside when unknown. */
export function climateRegionOf(state: string): Pick<ClimateRegion, 'key' | 'name'> {
	return REGION_OF_STATE.get(state.trim().toUpperCase()) ?? OUTSIDE_REGIONS;
}

/** Every (state, region key, region name, position) for a SQL VALUES list, regions in order. */
export function climateRegionRows(): {
	state: string;
	key: string;
	name: string;
	position: number;
}[] {
	return CLIMATE_REGIONS.flatMap((region, position) =>
		region.states.map((state) => ({ state, key: region.key, name: region.name, position }))
	);
}
