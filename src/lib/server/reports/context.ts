// What every report query gets, and the SQL pieces they share: the range's bounds as
// instants in the shop's zone, and an instant's month or week there. Each report module
// sums in PostgreSQL and hands back ReportSections; nothing sums rows in JavaScript.
import { sql, type RawBuilder } from 'kysely';
import type { Db } from '$lib/server/db';
import type { IsoDate } from '$lib/format/dates';
import { formatCell } from '$lib/reports/cells';
import type { ReportFilter, ReportSection } from '$lib/reports/report';

export interface ReportContext {
	db: Db;
	/** First and last calendar day of the range, both included, in the shop's zone. */
	from: IsoDate;
	to: IsoDate;
	timeZone: string;
	today: IsoDate;
	/** Admins see money; keepers get the same report without its money columns. */
	money: boolean;
	/** The URL's query, for the report's own filters. */
	params: URLSearchParams;
}

/** What a report module returns; the endpoint adds the range and the names. */
export interface ReportBody {
	filters: ReportFilter[];
	sections: ReportSection[];
	notes: string[];
}

export type ReportRunner = (context: ReportContext) => Promise<ReportBody>;

/** The instant the range starts: midnight of `from` in the shop's zone. */
export function rangeStart(context: Pick<ReportContext, 'from' | 'timeZone'>): RawBuilder<Date> {
	return sql<Date>`((${context.from}::date)::timestamp at time zone ${context.timeZone})`;
}

/** The instant just after the range: midnight after `to` in the shop's zone (exclusive). */
export function rangeEnd(context: Pick<ReportContext, 'to' | 'timeZone'>): RawBuilder<Date> {
	return sql<Date>`(((${context.to}::date) + 1)::timestamp at time zone ${context.timeZone})`;
}

/** 'YYYY-MM' of a timestamptz column in the shop's zone. */
export function monthOf(column: string, timeZone: string): RawBuilder<string> {
	return sql<string>`to_char(${sql.ref(column)} at time zone ${timeZone}, 'YYYY-MM')`;
}

/** The Monday ('YYYY-MM-DD') of the ISO week a timestamptz column falls in, in the shop's zone. */
export function weekOf(column: string, timeZone: string): RawBuilder<string> {
	return sql<string>`to_char(date_trunc('week', ${sql.ref(column)} at time zone ${timeZone}), 'YYYY-MM-DD')`;
}

/** Every month of the range as 'YYYY-MM', for reports that show empty months as zero. */
export function monthSeries(context: Pick<ReportContext, 'from' | 'to'>): RawBuilder<string> {
	return sql<string>`to_char(generate_series(date_trunc('month', ${context.from}::date), ${context.to}::date, interval '1 month'), 'YYYY-MM')`;
}

/** A fraction kept to four decimals, or null when there is nothing to divide by. */
export function fraction(part: number, whole: number): number | null {
	if (!whole) return null;
	return Math.round((part / whole) * 10_000) / 10_000;
}

/** The filter's applied value when it is one of its options, else '' (all). */
export function chosen(params: URLSearchParams, key: string, values: readonly string[]): string {
	const raw = params.get(key) ?? '';
	return values.includes(raw) ? raw : '';
}

/** "Jan 1, 2026 to Mar 31, 2026": the range as the empty states and summaries say it. */
export function rangeWords(context: Pick<ReportContext, 'from' | 'to'>): string {
	return `${formatCell('date', context.from)} to ${formatCell('date', context.to)}`;
}

/** A species a report can be narrowed to. */
export interface SpeciesChoice {
	id: number;
	slug: string;
	common_name: string;
}

/**
 * The species filter every report shares: the shop's species by common name, the one
 * chosen in ?species= (or none, for all or an unknown slug), and the filter to show.
 */
export async function speciesFilter(
	context: Pick<ReportContext, 'db' | 'params'>,
	options: { allLabel?: string; onlyWithColonies?: boolean } = {}
): Promise<{ species: SpeciesChoice | null; filter: ReportFilter }> {
	const rows: SpeciesChoice[] = await context.db
		.selectFrom('species as s')
		.select(['s.id', 's.slug', 's.common_name'])
		.$if(options.onlyWithColonies === true, (q) =>
			q.where((eb) =>
				eb.exists(eb.selectFrom('colony as c').select('c.id').whereRef('c.species_id', '=', 's.id'))
			)
		)
		.orderBy('s.common_name')
		.execute();
	const value = chosen(
		context.params,
		'species',
		rows.map((s) => s.slug)
	);
	return {
		species: rows.find((s) => s.slug === value) ?? null,
		filter: {
			key: 'species',
			label: 'Species',
			value,
			options: [
				{ value: '', label: options.allLabel ?? 'All species' },
				...rows.map((s) => ({ value: s.slug, label: s.common_name }))
			]
		}
	};
}
