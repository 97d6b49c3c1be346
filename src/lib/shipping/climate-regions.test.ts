import zipcodes from 'zipcodes';
import { describe, expect, it } from 'vitest';
import { US_STATES } from '$lib/accounts/schemas';
import { SHIPPING_AREA_STATES } from './area';
import {
	CLIMATE_REGIONS,
	OUTSIDE_REGIONS,
	climateRegionOf,
	climateRegionRows
} from './climate-regions';

/** The mean position of a state's ZIP codes in the `zipcodes` dataset: roughly where people live. */
function centreOf(state: string): { lat: number; lon: number } {
	const places = zipcodes.lookupByState(state).filter((z) => z.latitude && z.longitude);
	expect(places.length).toBeGreaterThan(0);
	return {
		lat: places.reduce((sum, z) => sum + z.latitude, 0) / places.length,
		lon: places.reduce((sum, z) => sum + z.longitude, 0) / places.length
	};
}

describe('NCEI climate regions', () => {
	it('has the nine regions with NCEI’s state counts', () => {
		// NCEI "U.S. Climate Regions" (Karl and Koss, 1984), the counts from memory of its
		// lists: Northeast 11 (+ DC here), Southeast 6, Ohio Valley (Central) 7, Upper
		// Midwest (East North Central) 4, South 6, Northern Rockies and Plains (West North
		// Central) 5, Southwest 4, Northwest 3, West 2: the 48 contiguous states.
		expect(CLIMATE_REGIONS.map((r) => [r.name, r.states.length])).toEqual([
			['Northeast', 12],
			['Southeast', 6],
			['Ohio Valley', 7],
			['Upper Midwest', 4],
			['South', 6],
			['Northern Rockies and Plains', 5],
			['Southwest', 4],
			['Northwest', 3],
			['West', 2]
		]);
	});

	it('puts every state of the shipping area in exactly one region', () => {
		const listed = CLIMATE_REGIONS.flatMap((r) => r.states);
		expect(new Set(listed).size).toBe(listed.length);
		expect(new Set(listed)).toEqual(SHIPPING_AREA_STATES);
	});

	it('puts Alaska and Hawaii outside the nine, and any unknown code', () => {
		expect(climateRegionOf('AK')).toEqual(OUTSIDE_REGIONS);
		expect(climateRegionOf('HI')).toEqual(OUTSIDE_REGIONS);
		expect(climateRegionOf('PR')).toEqual(OUTSIDE_REGIONS);
		expect(climateRegionOf('')).toEqual(OUTSIDE_REGIONS);
		// Every code a customer can choose lands somewhere.
		for (const state of US_STATES) expect(climateRegionOf(state).name).toBeTruthy();
	});

	it('reads a char(2) code in any case', () => {
		expect(climateRegionOf('mn').name).toBe('Upper Midwest');
		expect(climateRegionOf(' TN ').name).toBe('Ohio Valley');
	});

	it('places the demo’s buyers by ZIP through the zipcodes dataset', () => {
		// Outside reference for ZIP → state: the `zipcodes` package. The regions are NCEI's.
		const expected: [zip: string, region: string][] = [
			['37902', 'Ohio Valley'], // Knoxville, TN: the shop
			['55401', 'Upper Midwest'], // Minneapolis, MN
			['85719', 'Southwest'], // Tucson, AZ
			['97103', 'Northwest'], // Astoria, OR
			['20001', 'Northeast'], // Washington, DC
			['33101', 'Southeast'], // Miami, FL
			['73301', 'South'], // Austin, TX
			['59601', 'Northern Rockies and Plains'], // Helena, MT
			['89501', 'West'], // Reno, NV
			['99501', 'Outside the contiguous US'] // Anchorage, AK
		];
		for (const [zip, region] of expected) {
			const place = zipcodes.lookup(zip);
			expect(place, zip).toBeDefined();
			expect(climateRegionOf(place!.state).name, zip).toBe(region);
		}
	});

	it('keeps each region’s states where the region lies on the map', () => {
		// Coarse boxes (degrees; longitude west is negative) drawn from general US geography,
		// from memory; each state's position is the mean of its ZIP codes in the zipcodes
		// dataset. A state typed into the wrong region falls outside its box.
		const boxes: Record<string, { lat: [number, number]; lon: [number, number] }> = {
			northeast: { lat: [38, 48], lon: [-81, -66] },
			southeast: { lat: [24, 39.5], lon: [-88.5, -75] },
			'ohio-valley': { lat: [35, 42.5], lon: [-93, -80] },
			'upper-midwest': { lat: [41, 49.5], lon: [-97.5, -82] },
			south: { lat: [25, 40], lon: [-104, -88] },
			'northern-rockies-plains': { lat: [40, 49.5], lon: [-116, -95] },
			southwest: { lat: [31, 42], lon: [-115, -102] },
			northwest: { lat: [42, 49.5], lon: [-125, -111] },
			west: { lat: [32, 42], lon: [-125, -114] }
		};
		for (const region of CLIMATE_REGIONS) {
			const box = boxes[region.key]!;
			for (const state of region.states) {
				const { lat, lon } = centreOf(state);
				expect(lat, `${state} latitude in ${region.name}`).toBeGreaterThanOrEqual(box.lat[0]);
				expect(lat, `${state} latitude in ${region.name}`).toBeLessThanOrEqual(box.lat[1]);
				expect(lon, `${state} longitude in ${region.name}`).toBeGreaterThanOrEqual(box.lon[0]);
				expect(lon, `${state} longitude in ${region.name}`).toBeLessThanOrEqual(box.lon[1]);
			}
		}
	});

	it('gives one SQL row per state, with the region’s position in the list', () => {
		const rows = climateRegionRows();
		expect(rows).toHaveLength(49);
		expect(rows.find((r) => r.state === 'OR')).toEqual({
			state: 'OR',
			key: 'northwest',
			name: 'Northwest',
			position: 7
		});
		expect(rows.find((r) => r.state === 'DC')?.position).toBe(0);
	});
});
