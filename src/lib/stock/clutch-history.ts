// One line of a clutch's history in words, for the timeline on the clutch page. Pure.
import type { IconName } from '$lib/components/icons';
import { clutchStateLabels, sizeClassLabels, stageLabels } from '$lib/format/labels';
import type { ClutchEventKind, ClutchStage, ClutchState, SizeClass } from '$lib/server/db/schema';

export type HistoryKind = ClutchEventKind | 'sale_ready_on' | 'note';

export interface HistoryLine {
	kind: HistoryKind;
	fromValue: string | null;
	toValue: string | null;
	countDelta: number;
}

export interface HistoryWords {
	/** The sentence, with `{clutch}` where the other clutch's code goes (a link on the page). */
	text: string;
	/** The other clutch of a merge or split, to link to. */
	otherCode: string | null;
	icon: IconName;
	/** loss: brick (the one place red belongs); care: amber; plain otherwise. */
	tone: 'plain' | 'loss' | 'care';
}

const animals = (n: number) => `${n} ${Math.abs(n) === 1 ? 'animal' : 'animals'}`;

function word<K extends string>(labels: Record<K, string>, value: string | null): string {
	return value !== null && value in labels ? labels[value as K] : (value ?? '—');
}

const stage = (v: string | null) => word<ClutchStage>(stageLabels, v);
const size = (v: string | null) => word<SizeClass>(sizeClassLabels, v);
const state = (v: string | null) => word<ClutchState>(clutchStateLabels, v);

/** `formatDate` turns a 'YYYY-MM-DD' into the words the page shows (formatShopDate). */
export function describeHistory(
	line: HistoryLine,
	formatDate: (isoDate: string) => string = (isoDate) => isoDate
): HistoryWords {
	const n = Math.abs(line.countDelta);
	const plain = (text: string, icon: IconName, otherCode: string | null = null): HistoryWords => ({
		text,
		otherCode,
		icon,
		tone: 'plain'
	});
	switch (line.kind) {
		case 'found':
			return plain(`Found: ${animals(n)}`, 'sprout');
		case 'stage':
			return plain(`Stage ${stage(line.fromValue)} → ${stage(line.toValue)}`, 'layers');
		case 'size_class':
			return plain(`Size class ${size(line.fromValue)} → ${size(line.toValue)}`, 'layers');
		case 'count':
			return plain(
				line.countDelta > 0
					? `Census ${line.fromValue} → ${line.toValue} alive: ${n} more found`
					: `Census ${line.fromValue} → ${line.toValue} alive: ${n} missing, counted as lost`,
				'checklist'
			);
		case 'loss':
			return { text: `Lost ${animals(n)}`, otherCode: null, icon: 'minus-square', tone: 'loss' };
		case 'pause':
			return {
				text: `Paused (${line.toValue === 'unwell' ? 'unwell' : 'molting'}) while ${state(line.fromValue).toLowerCase()}`,
				otherCode: null,
				icon: 'pause-circle',
				tone: 'care'
			};
		case 'unpause':
			return plain(`Unpaused, back to ${state(line.toValue).toLowerCase()}`, 'loop-arrows');
		case 'merge_in':
			return plain(`Took in ${animals(n)} from {clutch}`, 'arrow-right', line.fromValue);
		case 'merge_out':
			return plain(`All ${animals(n)} moved into {clutch}`, 'arrow-right', line.toValue);
		case 'split_in':
			return plain(`Split off {clutch} with ${animals(n)}`, 'grid', line.fromValue);
		case 'split_out':
			return plain(`${animals(n)} split off into {clutch}`, 'grid', line.toValue);
		case 'state':
			return plain(`${state(line.fromValue)} → ${state(line.toValue)}`, 'check-circle');
		case 'sale_ready_on':
			return plain(
				`Sale-ready date moved from ${line.fromValue ? formatDate(line.fromValue) : '—'} to ${line.toValue ? formatDate(line.toValue) : '—'}`,
				'calendar'
			);
		case 'note':
			return plain('Note edited', 'pencil');
	}
}
