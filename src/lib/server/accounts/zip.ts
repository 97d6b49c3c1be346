// US ZIP codes checked against the open ZIP dataset that the `zipcodes` package ships.
import zipcodes from 'zipcodes';

export type ZipPlace = {
	zip: string;
	city: string;
	state: string;
	latitude: number;
	longitude: number;
};

export function lookUpZip(zip: string): ZipPlace | null {
	const found = zipcodes.lookup(zip);
	if (!found || found.country !== 'US') return null;
	return {
		zip: String(found.zip),
		city: found.city,
		state: found.state,
		latitude: found.latitude,
		longitude: found.longitude
	};
}

/** Why a ZIP/state pair is refused, or null. */
export function zipProblem(zip: string, state: string): string | null {
	const place = lookUpZip(zip);
	if (!place) return 'That ZIP code does not exist.';
	if (state && place.state !== state) return `ZIP ${zip} is in ${place.state}, not ${state}.`;
	return null;
}
