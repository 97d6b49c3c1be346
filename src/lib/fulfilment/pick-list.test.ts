import { describe, expect, it } from 'vitest';
import { buildPickList, type PickLineInput } from './pick-list';

const animal = (speciesName: string, clutchCode: string, animals: number): PickLineInput => ({
	description: `${speciesName}, ${clutchCode}`,
	quantity: animals,
	animals,
	isLive: true,
	clutchCode,
	speciesName,
	stage: 'juvenile'
});
const supply = (description: string, quantity: number): PickLineInput => ({
	description,
	quantity,
	animals: 0,
	isLive: false,
	clutchCode: null,
	speciesName: null,
	stage: null
});

describe('the pick list', () => {
	it('groups by species, then clutch, adding up animals and naming each order once', () => {
		const list = buildPickList([
			{
				orderNumber: 'HL-10020',
				lines: [animal('Smooth slater', 'PLA-C2', 10), supply('Leaf litter, 1 gallon', 2)]
			},
			{
				orderNumber: 'HL-10021',
				lines: [
					animal('American giant millipede', 'NAR-C1', 2),
					animal('Smooth slater', 'PLA-C2', 2),
					animal('Smooth slater', 'PLA-C10', 10),
					animal('Smooth slater', 'PLA-C2', 10)
				]
			}
		]);
		expect(list.animals).toBe(34);
		expect(list.species.map((s) => [s.speciesName, s.animals])).toEqual([
			['American giant millipede', 2],
			['Smooth slater', 32]
		]);
		// Clutch codes sort by their number: C2 before C10.
		expect(list.species[1]!.clutches).toEqual([
			{
				clutchCode: 'PLA-C2',
				stage: 'juvenile',
				animals: 22,
				orders: [
					{ orderNumber: 'HL-10020', animals: 10 },
					{ orderNumber: 'HL-10021', animals: 12 }
				]
			},
			{
				clutchCode: 'PLA-C10',
				stage: 'juvenile',
				animals: 10,
				orders: [{ orderNumber: 'HL-10021', animals: 10 }]
			}
		]);
		expect(list.supplies).toEqual([
			{
				description: 'Leaf litter, 1 gallon',
				quantity: 2,
				orders: [{ orderNumber: 'HL-10020', quantity: 2 }]
			}
		]);
	});

	it('is empty for a day with nothing to pack', () => {
		expect(buildPickList([])).toEqual({ species: [], supplies: [], animals: 0 });
	});
});
