import { describe, expect, it } from 'vitest';
import { describeHistory } from './clutch-history';

const line = (
	kind: Parameters<typeof describeHistory>[0]['kind'],
	from: string | null,
	to: string | null,
	delta = 0
) => ({
	kind,
	fromValue: from,
	toValue: to,
	countDelta: delta
});

describe('describeHistory', () => {
	it('words a loss in brick and a pause in amber (the look rules: red only for loss)', () => {
		expect(describeHistory(line('loss', '20', '17', -3))).toMatchObject({
			text: 'Lost 3 animals',
			tone: 'loss'
		});
		expect(describeHistory(line('pause', 'ready', 'molting'))).toMatchObject({
			text: 'Paused (molting) while ready',
			tone: 'care'
		});
	});
	it('says which way a census went', () => {
		expect(describeHistory(line('count', '20', '16', -4)).text).toBe(
			'Census 20 → 16 alive: 4 missing, counted as lost'
		);
		expect(describeHistory(line('count', '16', '19', 3)).text).toBe(
			'Census 16 → 19 alive: 3 more found'
		);
	});
	it('names the other clutch of a merge or split for a link', () => {
		expect(describeHistory(line('merge_out', '10', 'NAR-C3', -10))).toMatchObject({
			text: 'All 10 animals moved into {clutch}',
			otherCode: 'NAR-C3'
		});
		expect(describeHistory(line('split_in', 'NAR-C1', '1', 1))).toMatchObject({
			text: 'Split off {clutch} with 1 animal',
			otherCode: 'NAR-C1'
		});
	});
	it('uses the shop words for stages and states, and the given date format', () => {
		expect(describeHistory(line('stage', 'juvenile', 'sub_adult')).text).toBe(
			'Stage Juvenile → Sub-adult'
		);
		expect(describeHistory(line('state', 'growing', 'ready')).text).toBe('Growing → Ready');
		expect(
			describeHistory(line('sale_ready_on', '2027-01-05', '2027-02-02'), (d) => `<${d}>`).text
		).toBe('Sale-ready date moved from <2027-01-05> to <2027-02-02>');
	});
});
