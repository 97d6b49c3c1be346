// The shape every owner's report answers in: sections of one table each, and a chart
// drawn from columns of that same table, so the picture and the numbers cannot differ.
// The JSON routes under /api/manage/reports send this; the page, the chart and the CSV
// all read it.
import type { IsoDate } from '$lib/format/dates';

export const REPORT_NAMES = [
	'sales',
	'survival',
	'tub-yield',
	'colony-health',
	'shipping',
	'stock-demand'
] as const;
export type ReportName = (typeof REPORT_NAMES)[number];

export function isReportName(value: string): value is ReportName {
	return (REPORT_NAMES as readonly string[]).includes(value);
}

/** What a report is for, shown on the reports index and above the report. */
export interface ReportAbout {
	name: ReportName;
	title: string;
	/** One sentence: the question the report answers. */
	question: string;
	/** Whether the report's range applies (the stock-and-demand report is "now"). */
	usesRange: boolean;
}

export const REPORTS: Record<ReportName, ReportAbout> = {
	sales: {
		name: 'sales',
		title: 'Sales',
		question: 'What sells, month by month and species by species, and what came back as refunds.',
		usesRange: true
	},
	survival: {
		name: 'survival',
		title: 'Survival',
		question: 'How many of the young found are still alive, and how many reach sale-ready.',
		usesRange: true
	},
	'tub-yield': {
		name: 'tub-yield',
		title: 'Tub yield',
		question: 'How many young each resting tub gives, by colony and by season.',
		usesRange: true
	},
	'colony-health': {
		name: 'colony-health',
		title: 'Colony health',
		question:
			'Which colonies are overdue a substrate refresh, how their moisture reads, and their molts and pest notes.',
		usesRange: true
	},
	shipping: {
		name: 'shipping',
		title: 'Shipping',
		question:
			'Boxes shipped per week, days held for weather, packs used, claims and their outcome, and DOA rates.',
		usesRange: true
	},
	'stock-demand': {
		name: 'stock-demand',
		title: 'Stock and demand',
		question: 'The animals coming up per species beside how many people wait for them.',
		usesRange: false
	}
};

/**
 * How a cell reads. `cents` is integer cents (USD); `percent` is a fraction 0–1 kept to
 * four decimals; `month` is 'YYYY-MM' and `week` the Monday 'YYYY-MM-DD' that starts it,
 * both in the shop's time zone.
 */
export type CellKind =
	'text' | 'count' | 'cents' | 'percent' | 'days' | 'date' | 'month' | 'week' | 'decimal';

export interface ReportColumn {
	key: string;
	label: string;
	kind: CellKind;
	/** A money figure: sent to admins only. */
	money?: boolean;
}

export type ReportCell = string | number | null;
export type ReportRow = Record<string, ReportCell>;

export interface ReportTable {
	caption: string;
	columns: ReportColumn[];
	rows: ReportRow[];
	/** An optional closing row (totals), keyed like the rows. */
	totals?: ReportRow;
}

export interface ChartSeries {
	/** A column key of the section's table. */
	key: string;
	label: string;
}

export interface ReportChart {
	/** 'stacked' stacks the series into one bar per label. */
	kind: 'bar' | 'stacked' | 'line';
	/** The chart's accessible name. */
	title: string;
	/** One or two sentences saying what the chart shows; read out with the name. */
	summary: string;
	/** The column whose values label the x axis (or the bars when horizontal). */
	labelKey: string;
	series: ChartSeries[];
	/** How the values read on the axis: one kind for all series. */
	unit: CellKind;
	/** Bars run sideways: for long labels such as species names. */
	horizontal?: boolean;
}

export interface ReportSection {
	/** Stable id: the CSV download names it (?section=). */
	id: string;
	title: string;
	lead?: string;
	/** Null when the section is a table only (for example, per-colony notes). */
	chart: ReportChart | null;
	table: ReportTable;
	/** Said in place of the chart and table when the table has no rows. */
	empty: string;
}

export interface FilterOption {
	value: string;
	label: string;
}

export interface ReportFilter {
	/** The URL parameter. */
	key: string;
	label: string;
	/** The first option is "all" with value ''. */
	options: FilterOption[];
	/** The applied value; '' for all. */
	value: string;
}

export interface ReportResult {
	report: ReportName;
	title: string;
	from: IsoDate;
	to: IsoDate;
	timeZone: string;
	/** The shop's today, the day the report was drawn. */
	today: IsoDate;
	/** Whether money columns were included (admins only). */
	money: boolean;
	filters: ReportFilter[];
	sections: ReportSection[];
	/** How figures are counted: short sentences under the report. */
	notes: string[];
}
