import { describe, expect, it } from 'vitest';
import { lookUpZip, zipProblem } from './zip';

describe('ZIP codes', () => {
	it('finds real ZIPs in the dataset with their state', () => {
		// USPS: 37902 is Knoxville, TN; 85719 Tucson, AZ; 97103 Astoria, OR (checked against the zipcodes dataset).
		expect(lookUpZip('37902')).toMatchObject({ city: 'Knoxville', state: 'TN' });
		expect(lookUpZip('85719')?.state).toBe('AZ');
		expect(lookUpZip('97103')?.state).toBe('OR');
	});
	it('refuses an unknown ZIP and a ZIP in another state', () => {
		expect(zipProblem('00000', 'TN')).toMatch(/does not exist/);
		expect(zipProblem('37902', 'MN')).toMatch(/in TN, not MN/);
		expect(zipProblem('55805', 'MN')).toBeNull();
	});
});
