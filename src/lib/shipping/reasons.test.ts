import { describe, expect, it } from 'vitest';
import { describeReason, reasonSentences } from './reasons';
import { REASON_RULES, type Reason } from './ship-check';

describe('describeReason', () => {
	it('names the reading, the place, the day and the limit, °C beside °F', () => {
		// 22 °F = −5.56 °C and 25 °F = −3.89 °C (NIST SP 811: t/°C = (t/°F − 32)/1.8), shown rounded.
		// 2027-01-12 is a Tuesday (paper calendar).
		const frost: Reason = {
			rule: 'hold_below',
			date: '2027-01-12',
			place: 'destination',
			valueF: 22,
			limitF: 25
		};
		expect(describeReason(frost)).toBe(
			'Low of 22 °F (\u22126 °C) at the destination on Tue, Jan 12, 2027 is below the 25 °F (\u22124 °C) hold limit.'
		);
	});

	it('says which pack a reading calls for', () => {
		// 38 °F = 3.3 °C, 50 °F = 10 °C, 91 °F = 32.8 °C, 85 °F = 29.4 °C (NIST SP 811 conversion).
		expect(
			describeReason({
				rule: 'heat_pack',
				date: '2026-12-07',
				place: 'origin',
				valueF: 38,
				limitF: 50
			})
		).toBe(
			'Low of 38 °F (3 °C) at the origin on Mon, Dec 7, 2026 is below 50 °F (10 °C), so the box gets a heat pack.'
		);
		expect(
			describeReason({
				rule: 'cold_pack',
				date: '2026-12-08',
				place: 'destination',
				valueF: 91,
				limitF: 85
			})
		).toContain(
			'High of 91 °F (33 °C) at the destination on Tue, Dec 8, 2026 is above 85 °F (29 °C)'
		);
	});

	it('speaks of the ship date for both packs and of the missing day for no forecast', () => {
		expect(
			describeReason({
				rule: 'both_packs',
				date: '2026-06-01',
				place: 'origin',
				valueF: 0,
				limitF: 0
			})
		).toBe(
			'Shipping on Mon, Jun 1, 2026 would need both a heat pack and a cold pack, which cannot share a box, so that day is ruled out.'
		);
		const missing = describeReason({
			rule: 'no_forecast',
			date: '2026-12-08',
			place: 'destination',
			valueF: 0,
			limitF: 0
		});
		expect(missing).toContain('no forecast yet for the destination on Tue, Dec 8, 2026');
		expect(missing).not.toContain('°F'); // the zero placeholders are never shown as readings
	});

	it('has a sentence for every rule the ship check can report', () => {
		expect(Object.keys(reasonSentences).sort()).toEqual([...REASON_RULES].sort());
	});

	it('still reads sensibly for a rule it does not know', () => {
		expect(
			describeReason({
				rule: 'flood_watch',
				date: '2026-12-08',
				place: 'origin',
				valueF: 0,
				limitF: 0
			})
		).toBe('Rule "flood_watch" fired at the origin on Tue, Dec 8, 2026.');
	});
});
