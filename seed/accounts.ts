// The people of the demo shop, all invented. Addresses are made up; the ZIPs are real
// places chosen for their climate so the ship check has cold, hot and mild routes.

export type DemoRole = 'admin' | 'keeper' | 'customer';
export type DemoClimate = 'cold' | 'hot' | 'mild';

export interface DemoAccount {
	email: string;
	name: string;
	role: DemoRole;
	zip?: string;
	climate?: DemoClimate;
}

/** The one password of every demo account: for the local demo only, printed by npm start. */
export const DEMO_PASSWORD = 'leaf litter and loam';

export const DEMO_ACCOUNTS: ReadonlyArray<DemoAccount> = [
	{ email: 'wren@mossback.example.com', name: 'Wren Calloway', role: 'admin' },
	{ email: 'teo@mossback.example.com', name: 'Teo Marsh', role: 'keeper' },
	{
		email: 'dagny.halvorsen@example.com',
		name: 'Dagny Halvorsen',
		role: 'customer',
		zip: '55805',
		climate: 'cold'
	},
	{
		email: 'marisol.ocampo@example.com',
		name: 'Marisol Ocampo',
		role: 'customer',
		zip: '85719',
		climate: 'hot'
	},
	{
		email: 'jory.whitfield@example.test',
		name: 'Jory Whitfield',
		role: 'customer',
		zip: '97103',
		climate: 'mild'
	},
	{
		email: 'ines.farrow@example.test',
		name: 'Ines Farrow',
		role: 'customer',
		zip: '55604',
		climate: 'cold'
	}
];

export interface DemoShipAddress {
	line1: string;
	line2?: string;
	city: string;
	state: string;
}

/** Ship-to addresses of the demo customers, keyed by e-mail; the ZIP is the account's. */
export const DEMO_SHIP_ADDRESSES: Readonly<Record<string, DemoShipAddress>> = {
	'dagny.halvorsen@example.com': { line1: '418 Birchwood Lane', city: 'Duluth', state: 'MN' },
	'marisol.ocampo@example.com': {
		line1: '2210 Saguaro Wash Court',
		line2: 'Unit 4',
		city: 'Tucson',
		state: 'AZ'
	},
	'jory.whitfield@example.test': { line1: '77 Tidewater Row', city: 'Astoria', state: 'OR' },
	'ines.farrow@example.test': { line1: '9 Lookout Ridge Road', city: 'Grand Marais', state: 'MN' }
};

/** How long before the demo's "today" each person signed up (days). */
export const DEMO_JOINED_DAYS_AGO: Readonly<Record<string, number>> = {
	'wren@mossback.example.com': 560,
	'teo@mossback.example.com': 400,
	'jory.whitfield@example.test': 262,
	'dagny.halvorsen@example.com': 212,
	'marisol.ocampo@example.com': 163,
	'ines.farrow@example.test': 131
};
