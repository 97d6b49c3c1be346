// Species on PostgreSQL: create and update write the row and one audit entry each in
// the same transaction; names already taken and temperatures out of order come back
// as field errors, and nothing is written.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	speciesFormSchema,
	speciesValuesFromForm,
	type SpeciesValues
} from '../../src/lib/care/species-schema';
import {
	createSpecies,
	getSpeciesBySlug,
	listSpecies,
	listSpeciesColonies,
	uniqueViolation,
	updateSpecies
} from '../../src/lib/server/species/species';
import { scratchDatabase, type ScratchDatabase } from './support/databases';

const narceus: SpeciesValues = {
	slug: 'narceus-americanus',
	scientific_name: 'Narceus americanus',
	common_name: 'American giant millipede',
	animal_group: 'millipede',
	summary: 'The big olive-brown millipede of eastern woodlands.',
	temp_low_f: 62,
	temp_ideal_low_f: 70,
	temp_ideal_high_f: 77,
	temp_high_f: 86,
	moisture_level: 'moist',
	substrate_notes: 'At least 5 to 6 in of house mix.',
	diet: 'Decaying hardwood leaves and rotten wood.',
	adult_length_mm: 100,
	handling_notes: 'Let it walk onto a flat, open hand.',
	cautions: '',
	grow_out_weeks: 30,
	refresh_interval_days: 120,
	tub_hold_days: 49,
	molt_quiet_days: 21
};

describe('species', () => {
	let scratch: ScratchDatabase;
	let actor: { userId: string; ip: string };

	beforeAll(async () => {
		scratch = await scratchDatabase();
		const keeper = await scratch.db
			.insertInto('User')
			.values({ email: 'teo@mossback.test', name: 'Teo Marsh' })
			.returning('id')
			.executeTakeFirstOrThrow();
		actor = { userId: keeper.id, ip: '127.0.0.1' };
	});
	afterAll(async () => {
		await scratch?.drop();
	});

	const auditRows = (action: string) =>
		scratch.db
			.selectFrom('audit_log')
			.selectAll()
			.where('action', '=', action)
			.orderBy('id')
			.execute();
	const speciesCount = async () =>
		Number(
			(
				await scratch.db
					.selectFrom('species')
					.select((eb) => eb.fn.countAll<number>().as('n'))
					.executeTakeFirstOrThrow()
			).n
		);

	it('creates a species with its audit entry', async () => {
		const outcome = await createSpecies(scratch.db, actor, narceus, { slugTyped: false });
		expect(outcome.ok).toBe(true);
		if (!outcome.ok) return;
		expect(outcome.species).toMatchObject(narceus);
		const audit = await auditRows('species.create');
		expect(audit).toHaveLength(1);
		expect(audit[0]).toMatchObject({
			actor_user_id: actor.userId,
			actor_ip: '127.0.0.1',
			entity: 'species',
			entity_id: String(outcome.species.id)
		});
		expect(audit[0]!.detail).toMatchObject({
			scientific_name: 'Narceus americanus',
			slug: 'narceus-americanus'
		});
		expect(await getSpeciesBySlug(scratch.db, 'narceus-americanus')).toMatchObject({
			id: outcome.species.id
		});
	});

	it('creates from the posted form, converting weeks and inches', async () => {
		const body = new FormData();
		for (const [key, value] of Object.entries({
			scientificName: 'Porcellio laevis',
			commonName: 'Smooth slater',
			slug: '',
			animalGroup: 'isopod',
			tempLowF: '62',
			tempIdealLowF: '70',
			tempIdealHighF: '78',
			tempHighF: '88',
			moistureLevel: 'moist',
			adultSize: '0.75',
			adultSizeUnit: 'in',
			growOutWeeks: '10',
			refreshInterval: '13',
			refreshIntervalUnit: 'weeks',
			tubHold: '4',
			tubHoldUnit: 'weeks',
			moltQuietDays: '14'
		}))
			body.set(key, value);
		const form = await superValidate(body, zod4(speciesFormSchema));
		expect(form.valid).toBe(true);
		const outcome = await createSpecies(scratch.db, actor, speciesValuesFromForm(form.data), {
			slugTyped: false
		});
		expect(outcome.ok).toBe(true);
		if (!outcome.ok) return;
		// 0.75 in × 25.4 = 19.05 mm → 19; 13 weeks = 91 days; 4 weeks = 28 days.
		expect(outcome.species).toMatchObject({
			slug: 'porcellio-laevis',
			adult_length_mm: 19,
			refresh_interval_days: 91,
			tub_hold_days: 28,
			molt_quiet_days: 14
		});
	});

	it('updates a species and records what changed, from and to', async () => {
		const before = (await getSpeciesBySlug(scratch.db, 'narceus-americanus'))!;
		const outcome = await updateSpecies(
			scratch.db,
			actor,
			before.id,
			{
				...narceus,
				temp_ideal_high_f: 78,
				tub_hold_days: 56,
				diet: 'Leaves, rotten wood, squash.'
			},
			{ slugTyped: true }
		);
		expect(outcome).toMatchObject({ ok: true });
		if (!outcome?.ok) return;
		expect(outcome.changed.sort()).toEqual(['diet', 'temp_ideal_high_f', 'tub_hold_days']);
		expect(outcome.species.updated_at.getTime()).toBeGreaterThanOrEqual(
			before.updated_at.getTime()
		);
		const audit = await auditRows('species.update');
		expect(audit).toHaveLength(1);
		expect(audit[0]).toMatchObject({ entity: 'species', entity_id: String(before.id) });
		expect(audit[0]!.detail).toEqual({
			slug: 'narceus-americanus',
			changes: {
				temp_ideal_high_f: { from: 77, to: 78 },
				tub_hold_days: { from: 49, to: 56 },
				diet: { from: narceus.diet, to: 'Leaves, rotten wood, squash.' }
			}
		});
	});

	it('writes nothing when nothing changed', async () => {
		const current = (await getSpeciesBySlug(scratch.db, 'narceus-americanus'))!;
		const { id: _id, created_at: _created, updated_at: _updated, ...values } = current;
		const outcome = await updateSpecies(scratch.db, actor, current.id, values, { slugTyped: true });
		expect(outcome).toMatchObject({ ok: true, changed: [] });
		expect(await auditRows('species.update')).toHaveLength(1);
	});

	it('refuses a scientific name another species has, as a field error', async () => {
		const before = await speciesCount();
		const outcome = await createSpecies(
			scratch.db,
			actor,
			{ ...narceus, slug: 'narceus-again', scientific_name: 'Narceus americanus' },
			{ slugTyped: true }
		);
		expect(outcome).toEqual({
			ok: false,
			fieldErrors: { scientificName: 'Another species already has this scientific name.' }
		});
		// The same name in other letter case is the same name to a buyer.
		const shouted = await createSpecies(
			scratch.db,
			actor,
			{ ...narceus, slug: 'narceus-loud', scientific_name: 'Narceus Americanus' },
			{ slugTyped: true }
		);
		expect(shouted.ok).toBe(false);
		if (!shouted.ok) expect(Object.keys(shouted.fieldErrors)).toEqual(['scientificName']);
		expect(await speciesCount()).toBe(before);
		expect(await auditRows('species.create')).toHaveLength(2);
	});

	it('refuses a web name another species uses, and says whether it was typed or made', async () => {
		const slater = (await getSpeciesBySlug(scratch.db, 'porcellio-laevis'))!;
		const typed = await updateSpecies(
			scratch.db,
			actor,
			slater.id,
			{ ...narceus, scientific_name: 'Porcellio laevis', slug: 'narceus-americanus' },
			{ slugTyped: true }
		);
		expect(typed).toEqual({
			ok: false,
			fieldErrors: { slug: 'Another species already uses this web name; enter a different one.' }
		});
		const made = await createSpecies(
			scratch.db,
			actor,
			{ ...narceus, scientific_name: 'Narceus americanus annularis' },
			{ slugTyped: false }
		);
		expect(made.ok).toBe(false);
		if (!made.ok) expect(made.fieldErrors.slug).toMatch(/made from the scientific name/);
	});

	it('turns a unique violation from a racing save into the field error', async () => {
		// A second save that passed the pre-check still meets the UNIQUE constraint; the
		// error must still reach the form, not a 500. Two creates at once show it.
		const twin = { ...narceus, slug: 'glomeris-marginata', scientific_name: 'Glomeris marginata' };
		const outcomes = await Promise.all([
			createSpecies(scratch.db, actor, twin, { slugTyped: false }),
			createSpecies(scratch.db, actor, twin, { slugTyped: false })
		]);
		expect(outcomes.filter((o) => o.ok)).toHaveLength(1);
		const refused = outcomes.find((o) => !o.ok);
		expect(refused && !refused.ok && Object.keys(refused.fieldErrors).length).toBeGreaterThan(0);

		// The constraint names PostgreSQL gives the two UNIQUE columns map to their fields.
		const clash = (values: Partial<SpeciesValues>) =>
			scratch.db
				.insertInto('species')
				.values({ ...narceus, ...values })
				.execute()
				.then(
					() => null,
					(error: unknown) => error
				);
		const sameName = await clash({ slug: 'another-slug' });
		expect(uniqueViolation(sameName, true)).toEqual({
			scientificName: 'Another species already has this scientific name.'
		});
		const sameSlug = await clash({ scientific_name: 'Narceus annularis' });
		expect(uniqueViolation(sameSlug, false)?.slug).toMatch(/made from the scientific name/);
		expect(uniqueViolation(new Error('connection lost'), true)).toBeNull();
	});

	it('refuses temperatures out of order, on the field that breaks it, writing nothing', async () => {
		const before = await speciesCount();
		const outcome = await createSpecies(
			scratch.db,
			actor,
			{
				...narceus,
				slug: 'orthoporus-ornatus',
				scientific_name: 'Orthoporus ornatus',
				temp_ideal_high_f: 60
			},
			{ slugTyped: true }
		);
		expect(outcome.ok).toBe(false);
		if (!outcome.ok) expect(Object.keys(outcome.fieldErrors)).toEqual(['tempIdealHighF']);
		expect(await speciesCount()).toBe(before);

		const current = (await getSpeciesBySlug(scratch.db, 'narceus-americanus'))!;
		const update = await updateSpecies(
			scratch.db,
			actor,
			current.id,
			{ ...narceus, temp_low_f: 90 },
			{ slugTyped: true }
		);
		expect(update).toMatchObject({ ok: false });
		expect((await getSpeciesBySlug(scratch.db, 'narceus-americanus'))!.temp_low_f).toBe(62);

		// The database's own CHECK backs the form up.
		await expect(
			scratch.db
				.updateTable('species')
				.set({ temp_low_f: 90 })
				.where('id', '=', current.id)
				.execute()
		).rejects.toThrow(/check constraint/);

		// And the form puts the error beside the field before the server is asked.
		const body = new FormData();
		for (const [key, value] of Object.entries({
			scientificName: 'Orthoporus ornatus',
			commonName: 'Desert millipede',
			animalGroup: 'millipede',
			tempLowF: '65',
			tempIdealLowF: '80',
			tempIdealHighF: '79',
			tempHighF: '88',
			moistureLevel: 'drier',
			adultSize: '110',
			adultSizeUnit: 'mm',
			growOutWeeks: '36',
			refreshInterval: '150',
			refreshIntervalUnit: 'days',
			tubHold: '8',
			tubHoldUnit: 'weeks',
			moltQuietDays: '21'
		}))
			body.set(key, value);
		const form = await superValidate(body, zod4(speciesFormSchema));
		expect(form.valid).toBe(false);
		expect(Object.keys(form.errors)).toEqual(['tempIdealHighF']);
	});

	it('lists species with their active colonies and live clutches', async () => {
		const narceusRow = (await getSpeciesBySlug(scratch.db, 'narceus-americanus'))!;
		const colony = (code: string, retired: string | null) => ({
			code,
			species_id: narceusRow.id,
			name: `Colony ${code}`,
			enclosure_length_in: '16',
			enclosure_width_in: '11',
			substrate_depth_in: '6',
			started_on: '2026-01-10',
			retired_on: retired
		});
		await scratch.db
			.insertInto('colony')
			.values([colony('NAR-02', null), colony('NAR-01', null), colony('NAR-03', '2026-06-01')])
			.execute();
		const clutch = (code: string, state: 'growing' | 'sold_out') => ({
			code,
			species_id: narceusRow.id,
			origin: 'bought_in' as const,
			generation: 1,
			found_on: '2026-10-01',
			stage: 'juvenile' as const,
			size_class: 'small' as const,
			count_found: 10,
			count_alive: 10,
			state,
			sale_ready_on: '2027-04-01'
		});
		await scratch.db
			.insertInto('clutch')
			.values([clutch('NAR-C1', 'growing'), clutch('NAR-C2', 'sold_out')])
			.execute();

		const listed = await listSpecies(scratch.db);
		const row = listed.find((s) => s.slug === 'narceus-americanus');
		expect(row).toMatchObject({ activeColonies: 2, liveClutches: 1, growOutWeeks: 30 });
		expect(listed.find((s) => s.slug === 'porcellio-laevis')).toMatchObject({
			activeColonies: 0,
			liveClutches: 0
		});
		const colonies = await listSpeciesColonies(scratch.db, narceusRow.id);
		expect(colonies.map((c) => c.code)).toEqual(['NAR-01', 'NAR-02', 'NAR-03']);
	});
});
