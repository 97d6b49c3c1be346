import { describe, expect, it } from 'vitest';
import { groupUpcoming } from './home';

const narceus = {
	speciesId: 1,
	slug: 'narceus-americanus',
	commonName: 'American giant millipede',
	scientificName: 'Narceus americanus',
	group: 'millipede' as const
};
const porcellio = {
	speciesId: 2,
	slug: 'porcellio-laevis',
	commonName: 'Dairy cow isopod',
	scientificName: 'Porcellio laevis',
	group: 'isopod' as const
};

describe('groupUpcoming', () => {
	it('merges clutches of one species that read the same, keeping the earliest date', () => {
		const grouped = groupUpcoming(
			[
				{ ...narceus, saleReadyOn: '2026-03-22', countAlive: 12, clutches: 1 },
				{ ...narceus, saleReadyOn: '2026-03-23', countAlive: 8, clutches: 2 },
				{ ...narceus, saleReadyOn: '2026-05-04', countAlive: 30, clutches: 1 },
				{ ...porcellio, saleReadyOn: '2026-03-10', countAlive: 40, clutches: 1 }
			],
			'2026-03-09'
		);
		expect(grouped).toEqual([
			{
				...narceus,
				batches: [
					// 13 and 14 days out both round to about 2 weeks.
					{
						saleReadyOn: '2026-03-22',
						readyIn: 'ready in about 2 weeks',
						countAlive: 20,
						clutches: 3
					},
					// 56 days out: 8 weeks.
					{
						saleReadyOn: '2026-05-04',
						readyIn: 'ready in about 8 weeks',
						countAlive: 30,
						clutches: 1
					}
				]
			},
			{
				...porcellio,
				batches: [
					{ saleReadyOn: '2026-03-10', readyIn: 'ready within a week', countAlive: 40, clutches: 1 }
				]
			}
		]);
	});

	it('returns nothing when nothing is growing', () => {
		expect(groupUpcoming([], '2026-03-09')).toEqual([]);
	});
});
