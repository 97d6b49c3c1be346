import { describe, expect, it } from 'vitest';
import { DEMO_SPECIES } from '../../../seed/species';
import {
	LARGE_MILLIPEDE_MM,
	STANDARD_CAUTIONS,
	careSheet,
	careSheetGaps,
	formatAdultSize,
	formatBand,
	type CareSheet,
	type CareSheetSpecies
} from './care-sheet';

const narceus: CareSheetSpecies = {
	scientific_name: 'Narceus americanus',
	common_name: 'American giant millipede',
	animal_group: 'millipede',
	summary: 'The big olive-brown millipede of eastern woodlands.',
	temp_low_f: 62,
	temp_ideal_low_f: 70,
	temp_ideal_high_f: 77,
	temp_high_f: 86,
	moisture_level: 'moist',
	substrate_notes: 'At least 5 to 6 in of house mix over rotting hardwood.',
	diet: 'Decaying hardwood leaves and rotten wood.',
	adult_length_mm: 100,
	handling_notes: 'Let it walk onto a flat, open hand.',
	cautions: 'Molting animals curl up in a chamber; do not dig them up.',
	grow_out_weeks: 30,
	refresh_interval_days: 120,
	tub_hold_days: 49,
	molt_quiet_days: 21
};

const porcellio: CareSheetSpecies = {
	...narceus,
	scientific_name: 'Porcellio laevis',
	common_name: 'Smooth slater',
	animal_group: 'isopod',
	adult_length_mm: 18,
	cautions: ''
};

function section(sheet: CareSheet, id: string) {
	const found = sheet.sections.find((s) => s.id === id);
	if (!found) throw new Error(`no ${id} section`);
	return found;
}

function texts(sheet: CareSheet, id: string): string[] {
	return section(sheet, id).lines.map((line) =>
		line.label ? `${line.label}: ${line.text}` : line.text
	);
}

describe('careSheet', () => {
	it('names the animal and keeps the sections in reading order', () => {
		const sheet = careSheet(narceus);
		expect(sheet.title).toBe('American giant millipede');
		expect(sheet.scientificName).toBe('Narceus americanus');
		expect(sheet.groupLabel).toBe('Millipede');
		expect(sheet.sections.map((s) => s.id)).toEqual([
			'temperature',
			'moisture',
			'substrate',
			'diet',
			'size',
			'handling',
			'routine',
			'cautions'
		]);
	});

	it('gives the temperature band in °F with °C beside', () => {
		// NIST SP 811 formula t/°C = (t/°F − 32)/1.8: 70 → 21.1, 77 → 25, 62 → 16.7, 86 → 30.
		expect(texts(careSheet(narceus), 'temperature')).toEqual([
			'Ideal: 70 °F (21 °C) to 77 °F (25 °C)',
			'Tolerated: 62 °F (17 °C) to 86 °F (30 °C)',
			// Common practice (PRODUCT.md): comfortable room temperature suits most of these animals.
			'Comfortable room temperature suits most of these animals.'
		]);
		expect(formatBand(72, 72)).toBe('72 °F (22 °C)');
	});

	it('explains the squeeze test as the trade does it', () => {
		const lines = texts(careSheet(narceus), 'moisture');
		// Common practice (PRODUCT.md): drops of water = too wet; a little moisture felt on
		// the hand = right; dry feel = too dry; at least half the enclosure at "right".
		expect(lines).toContain('Too wet: drops of water come out.');
		expect(lines.find((l) => l.startsWith('Right:'))).toMatch(/little moisture on your hand/);
		expect(lines).toContain('Too dry: it feels dry.');
		expect(lines.some((l) => /gradient is fine/.test(l) && /at least half/.test(l))).toBe(true);
		expect(lines[0]).toMatch(/^Moist: /);
		expect(texts(careSheet({ ...narceus, moisture_level: 'drier' }), 'moisture')[0]).toMatch(
			/^Drier: .*lower layers/
		);
		expect(texts(careSheet({ ...narceus, moisture_level: 'humid' }), 'moisture')[0]).toMatch(
			/^Humid: .*never let it dry out/
		);
	});

	it('shows the cautions the product always shows, after the species’ own', () => {
		const millipede = section(careSheet(narceus), 'cautions').lines;
		expect(millipede[0]).toMatchObject({ source: 'species', text: narceus.cautions });
		const words = millipede.map((l) => l.text);
		// Cautions (PRODUCT.md): defensive fluid that stains and irritates; wash hands after
		// every handling; handle low over a soft surface; no heat mats under burrowers; the
		// buyer checks their state's rules, the breeder holds the permits (USDA APHIS in the US).
		expect(words).toContain(STANDARD_CAUTIONS.defensiveFluid);
		expect(words.find((w) => /defensive fluid/.test(w))).toMatch(/stain.*irritate/);
		expect(words.find((w) => /^Wash your hands after every handling/.test(w))).toBeDefined();
		expect(words.find((w) => /low, over a soft surface/.test(w))).toBeDefined();
		expect(words.find((w) => /No heat mat/.test(w))).toMatch(/burrow/);
		const rules = words.find((w) => /permit/.test(w));
		expect(rules).toMatch(/USDA APHIS/);
		expect(rules).toMatch(/Check your state’s rules/);
		expect(rules).toMatch(/breeder is responsible/);
		// Every caution carries the caution shape, the species' own included.
		expect(millipede.every((l) => l.tone === 'caution')).toBe(true);
	});

	it('keeps the defensive-fluid caution to millipedes, the rest for every group', () => {
		const isopod = section(careSheet(porcellio), 'cautions').lines.map((l) => l.text);
		expect(isopod).not.toContain(STANDARD_CAUTIONS.defensiveFluid);
		expect(isopod).toContain(STANDARD_CAUTIONS.washHands);
		expect(isopod).toContain(STANDARD_CAUTIONS.noHeatMat);
		expect(isopod).toContain(STANDARD_CAUTIONS.localRules);
	});

	it('warns not to dig up molting animals, and gives the quiet days', () => {
		const sheet = careSheet(narceus);
		// Common practice (PRODUCT.md): molting animals burrow; disturbing them can kill them.
		const handling = section(sheet, 'handling').lines;
		expect(handling.find((l) => l.tone === 'caution')?.text).toMatch(/burrow.*can kill them/);
		expect(texts(sheet, 'routine')).toContain(
			'After a molt: Leave the enclosure undisturbed, and do not dig, for 21 days after you see a molt.'
		);
	});

	it('gives the routine with the trade’s intervals', () => {
		const lines = texts(careSheet(narceus), 'routine');
		// Common practice (PRODUCT.md): moisture checked weekly; half the substrate every 3–6
		// months; old substrate kept 1–2 months and checked; a well-set colony goes about a week
		// without care.
		expect(lines[0]).toMatch(/once a week/);
		expect(lines).toContain(
			'Substrate: Refresh half of the substrate every 120 days (about 4 months).'
		);
		expect(lines.find((l) => l.startsWith('Old substrate:'))).toMatch(
			/separate tub for 7 weeks and check it for eggs and young/
		);
		expect(lines).toContain('A well-set enclosure can go about a week without care.');
		expect(
			texts(careSheet({ ...narceus, tub_hold_days: 45 }), 'routine').find((l) =>
				l.startsWith('Old substrate:')
			)
		).toMatch(/for 45 days/);
	});

	it('shows the heat-treatment step with its fire and burn caution', () => {
		const substrate = section(careSheet(narceus), 'substrate').lines;
		expect(substrate[0]).toMatchObject({ source: 'species', text: narceus.substrate_notes });
		// Common practice (PRODUCT.md): about 200 °F for about 30 minutes; fire and burn
		// risk; let it cool. 200 °F = 93.3 °C (NIST SP 811 formula).
		const heat = substrate.find((l) => l.tone === 'caution')?.text;
		expect(heat).toMatch(/200 °F \(93 °C\) for about 30 minutes/);
		expect(heat).toMatch(/fire and burn risk/);
		expect(heat).toMatch(/let it cool/);
	});

	it('gives the adult size in mm with inches beside, and the large-millipede note', () => {
		// 1 in = 25.4 mm exactly (NIST SP 811): 100 mm = 3.94 in; 152 mm = 5.98 in → "6 in".
		expect(formatAdultSize(100)).toBe('100 mm (3.9 in)');
		expect(formatAdultSize(152)).toBe('152 mm (6 in)');
		// Common practice (PRODUCT.md): large millipede species reach 6 inches or more.
		expect(LARGE_MILLIPEDE_MM).toBe(152);
		expect(texts(careSheet(narceus), 'size').some((l) => /6 in or more/.test(l))).toBe(false);
		const giant = careSheet({ ...narceus, adult_length_mm: 200 });
		expect(texts(giant, 'size').some((l) => /6 in or more/.test(l))).toBe(true);
		expect(texts(careSheet(narceus), 'size')).toContain(
			'Growth: Young reach sale size in about 30 weeks.'
		);
	});

	it('leaves out a section the keeper left empty, and lists what is missing', () => {
		const bare = { ...narceus, diet: '  ', summary: '', handling_notes: '' };
		const sheet = careSheet(bare);
		expect(sheet.sections.map((s) => s.id)).not.toContain('diet');
		// The handling section still carries the molt caution.
		expect(section(sheet, 'handling').lines).toHaveLength(1);
		expect(careSheetGaps(bare)).toEqual(['summary', 'diet', 'handling notes']);
		expect(careSheetGaps(narceus)).toEqual([]);
	});

	it('is plain data: it survives a JSON round trip unchanged', () => {
		const sheet = careSheet(narceus);
		expect(JSON.parse(JSON.stringify(sheet))).toEqual(sheet);
	});

	it('builds a sheet for every demo species', () => {
		for (const demo of DEMO_SPECIES) {
			const sheet = careSheet({
				scientific_name: demo.scientificName,
				common_name: demo.commonName,
				animal_group: demo.group,
				summary: demo.summary,
				temp_low_f: demo.tempLowF,
				temp_ideal_low_f: demo.tempIdealLowF,
				temp_ideal_high_f: demo.tempIdealHighF,
				temp_high_f: demo.tempHighF,
				moisture_level: demo.moisture,
				substrate_notes: demo.substrateNotes,
				diet: demo.diet,
				adult_length_mm: demo.adultLengthMm,
				handling_notes: demo.handlingNotes,
				cautions: demo.cautions,
				grow_out_weeks: demo.growOutWeeks,
				refresh_interval_days: demo.refreshIntervalDays,
				tub_hold_days: demo.tubHoldDays,
				molt_quiet_days: 21
			});
			expect(sheet.sections).toHaveLength(8);
		}
	});
});
