// How a report cell reads on screen and in the CSV. Money is integer cents throughout;
// it becomes dollars only here, by integer arithmetic.
import { formatCents } from '$lib/format/money';
import type { CellKind, ReportCell, ReportColumn, ReportSection } from './report';

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const counts = new Intl.NumberFormat('en-US');
const decimals = new Intl.NumberFormat('en-US', { maximumFractionDigits: 2 });

function monthLabel(yearMonth: string): string {
	const [year, month] = yearMonth.split('-');
	return `${MONTHS[Number(month) - 1]} ${year}`;
}

function dayLabel(isoDate: string): string {
	const [year, month, day] = isoDate.split('-');
	return `${MONTHS[Number(month) - 1]} ${Number(day)}, ${year}`;
}

/** A cell as the table shows it; '—' for no value. */
export function formatCell(kind: CellKind, value: ReportCell): string {
	if (value === null || value === '') return '—';
	if (typeof value === 'string' && kind !== 'month' && kind !== 'week' && kind !== 'date')
		return value;
	switch (kind) {
		case 'count':
			return counts.format(Number(value));
		case 'cents':
			return formatCents(Number(value));
		case 'percent':
			return `${(Math.round(Number(value) * 1000) / 10).toFixed(1)}%`;
		case 'days': {
			const days = Number(value);
			return `${counts.format(days)} ${days === 1 ? 'day' : 'days'}`;
		}
		case 'decimal':
			return decimals.format(Number(value));
		case 'month':
			return monthLabel(String(value));
		case 'week':
			return `Week of ${dayLabel(String(value))}`;
		case 'date':
			return dayLabel(String(value));
		default:
			return String(value);
	}
}

/** A short axis label: months as "Mar 2026", weeks as "Mar 2". */
export function axisLabel(kind: CellKind, value: ReportCell): string {
	if (kind === 'week' && typeof value === 'string') {
		const [, month, day] = value.split('-');
		return `${MONTHS[Number(month) - 1]} ${Number(day)}`;
	}
	return formatCell(kind, value);
}

/** Dollars from integer cents, exactly: 123456 → "1234.56", -5 → "-0.05". */
export function centsToDecimal(cents: number): string {
	const sign = cents < 0 ? '-' : '';
	const whole = Math.abs(Math.trunc(cents));
	return `${sign}${Math.floor(whole / 100)}.${String(whole % 100).padStart(2, '0')}`;
}

/** The header of a CSV column: units in the name, so the numbers stay plain. */
export function csvHeader(column: ReportColumn): string {
	if (column.kind === 'cents') return `${column.label} (USD)`;
	if (column.kind === 'percent') return `${column.label} (%)`;
	if (column.kind === 'days') return `${column.label} (days)`;
	return column.label;
}

/** A CSV value: dollars with two decimals, percents to two decimals, the rest as is. */
export function csvValue(kind: CellKind, value: ReportCell): string {
	if (value === null) return '';
	if (typeof value === 'string') return value;
	if (kind === 'cents') return centsToDecimal(value);
	if (kind === 'percent') return (Math.round(value * 10_000) / 100).toFixed(2);
	return String(value);
}

/** The section without its money columns, and without any chart series drawn from them. */
export function withoutMoney(section: ReportSection): ReportSection {
	const moneyKeys = new Set(section.table.columns.filter((c) => c.money).map((c) => c.key));
	if (moneyKeys.size === 0) return section;
	const strip = <T extends Record<string, ReportCell>>(row: T): T =>
		Object.fromEntries(Object.entries(row).filter(([key]) => !moneyKeys.has(key))) as T;
	const series = section.chart?.series.filter((s) => !moneyKeys.has(s.key)) ?? [];
	return {
		...section,
		chart: section.chart && series.length > 0 ? { ...section.chart, series } : null,
		table: {
			...section.table,
			columns: section.table.columns.filter((c) => !moneyKeys.has(c.key)),
			rows: section.table.rows.map(strip),
			...(section.table.totals ? { totals: strip(section.table.totals) } : {})
		}
	};
}
