// The pick list for a ship day: what to pull from which clutch, grouped by species and
// then clutch, so a keeper walks the rack once; supplies apart. Pure. Counts are
// animals (a group of 10 is 10), since that is what a keeper lifts out of a tub.

export interface PickLineInput {
	description: string;
	quantity: number;
	animals: number;
	isLive: boolean;
	clutchCode: string | null;
	speciesName: string | null;
	stage: string | null;
}

export interface PickClutch {
	clutchCode: string;
	stage: string | null;
	animals: number;
	orders: { orderNumber: string; animals: number }[];
}

export interface PickSpecies {
	speciesName: string;
	animals: number;
	clutches: PickClutch[];
}

export interface PickSupply {
	description: string;
	quantity: number;
	orders: { orderNumber: string; quantity: number }[];
}

export interface PickList {
	species: PickSpecies[];
	supplies: PickSupply[];
	/** Every animal on the list, for the heading. */
	animals: number;
}

const byName = (a: string, b: string) => a.localeCompare(b, 'en', { numeric: true });

/** Groups the orders' lines; orders keep the order given (the ship order). */
export function buildPickList(
	orders: readonly { orderNumber: string; lines: readonly PickLineInput[] }[]
): PickList {
	const species = new Map<string, Map<string, PickClutch>>();
	const supplies = new Map<string, PickSupply>();
	for (const order of orders)
		for (const line of order.lines) {
			if (line.clutchCode && line.speciesName) {
				const clutches = species.get(line.speciesName) ?? new Map<string, PickClutch>();
				species.set(line.speciesName, clutches);
				const clutch = clutches.get(line.clutchCode) ?? {
					clutchCode: line.clutchCode,
					stage: line.stage,
					animals: 0,
					orders: []
				};
				clutches.set(line.clutchCode, clutch);
				clutch.animals += line.animals;
				const seen = clutch.orders.find((o) => o.orderNumber === order.orderNumber);
				if (seen) seen.animals += line.animals;
				else clutch.orders.push({ orderNumber: order.orderNumber, animals: line.animals });
			} else {
				const supply = supplies.get(line.description) ?? {
					description: line.description,
					quantity: 0,
					orders: []
				};
				supplies.set(line.description, supply);
				supply.quantity += line.quantity;
				const seen = supply.orders.find((o) => o.orderNumber === order.orderNumber);
				if (seen) seen.quantity += line.quantity;
				else supply.orders.push({ orderNumber: order.orderNumber, quantity: line.quantity });
			}
		}
	const speciesList = [...species.entries()]
		.map(([speciesName, clutches]) => {
			const list = [...clutches.values()].sort((a, b) => byName(a.clutchCode, b.clutchCode));
			return { speciesName, clutches: list, animals: list.reduce((sum, c) => sum + c.animals, 0) };
		})
		.sort((a, b) => byName(a.speciesName, b.speciesName));
	return {
		species: speciesList,
		supplies: [...supplies.values()].sort((a, b) => byName(a.description, b.description)),
		animals: speciesList.reduce((sum, s) => sum + s.animals, 0)
	};
}
