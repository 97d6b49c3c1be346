import { describe, expect, it } from 'vitest';
import { centsToDecimal, csvHeader, csvValue, formatCell, withoutMoney } from './cells';
import type { ReportSection } from './report';

describe('report cells', () => {
	it('turns cents into dollars exactly, with the two minor units of USD (ISO 4217)', () => {
		expect(centsToDecimal(123456)).toBe('1234.56');
		expect(centsToDecimal(5)).toBe('0.05');
		expect(centsToDecimal(-2500)).toBe('-25.00');
		expect(centsToDecimal(0)).toBe('0.00');
	});

	it('writes CSV values plain, with the unit in the header', () => {
		expect(csvHeader({ key: 'net', label: 'Net', kind: 'cents' })).toBe('Net (USD)');
		expect(csvHeader({ key: 'share', label: 'Yielded', kind: 'percent' })).toBe('Yielded (%)');
		expect(csvValue('cents', 1999)).toBe('19.99');
		expect(csvValue('percent', 0.8571)).toBe('85.71');
		expect(csvValue('count', null)).toBe('');
		expect(csvValue('month', '2026-03')).toBe('2026-03');
	});

	it('reads cells for the table', () => {
		expect(formatCell('cents', -2500)).toMatch(/25\.00/);
		expect(formatCell('percent', 0.5)).toBe('50.0%');
		expect(formatCell('month', '2026-03')).toBe('Mar 2026');
		expect(formatCell('week', '2026-03-02')).toBe('Week of Mar 2, 2026');
		expect(formatCell('days', 1)).toBe('1 day');
		expect(formatCell('count', 12345)).toBe('12,345');
		expect(formatCell('count', null)).toBe('—');
	});

	it('takes the money out of a section for keepers, chart series too', () => {
		const section: ReportSection = {
			id: 'by-month',
			title: 'By month',
			empty: 'Nothing.',
			chart: {
				kind: 'bar',
				title: 'Net by month',
				summary: '',
				labelKey: 'month',
				series: [{ key: 'net', label: 'Net' }],
				unit: 'cents'
			},
			table: {
				caption: 'Sales',
				columns: [
					{ key: 'month', label: 'Month', kind: 'month' },
					{ key: 'animals', label: 'Animals', kind: 'count' },
					{ key: 'net', label: 'Net', kind: 'cents', money: true }
				],
				rows: [{ month: '2026-01', animals: 3, net: 4500 }],
				totals: { month: 'All', animals: 3, net: 4500 }
			}
		};
		const stripped = withoutMoney(section);
		expect(stripped.chart).toBeNull();
		expect(stripped.table.columns.map((c) => c.key)).toEqual(['month', 'animals']);
		expect(stripped.table.rows).toEqual([{ month: '2026-01', animals: 3 }]);
		expect(stripped.table.totals).toEqual({ month: 'All', animals: 3 });
		expect(JSON.stringify(stripped)).not.toContain('4500');
	});
});
