// What the listing pages' actions share: the form read into the listing module's input,
// a refusal put beside its field, and the tier editor's add and remove buttons (which
// post the whole form, so nothing typed is lost, and answer with one row more or less).
import type { RequestEvent } from '@sveltejs/kit';
import {
	setError,
	superValidate,
	type FormPathLeavesWithErrors,
	type SuperValidated
} from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	listingFormSchema,
	readTierRows,
	withTierRowAdded,
	withTierRowRemoved,
	type ListingForm
} from '$lib/stock/listing-rules';
import type { ListingInput, ListingRefusal } from './listings';

export type ListingFormData = SuperValidated<ListingForm>;

/** The module's input from a valid form (the schema already read the tiers once). */
export function listingInputOf(form: ListingForm): ListingInput {
	return {
		title: form.title,
		description: form.description,
		unitSize: form.unitSize,
		sex: form.sex,
		isLive: form.isLive,
		speciesId: form.speciesId ?? null,
		supplyStock: form.supplyStock ?? null,
		tiers: readTierRows(form.tierQuantity, form.tierPrice).tiers
	};
}

/** A refusal beside the field it names (a problem about the tiers as a set goes on the list). */
export function refusedListing(form: ListingFormData, refusal: ListingRefusal) {
	const field = refusal.field === 'tierQuantity' ? 'tierQuantity._errors' : refusal.field;
	if (!field) return setError(form, refusal.problem);
	return setError(form, field as FormPathLeavesWithErrors<ListingForm>, refusal.problem);
}

/**
 * The tier editor's buttons without JavaScript: the form comes back as typed with a row
 * added (or the one asked for removed), and without errors: nothing was saved yet.
 */
export async function tierRowAction(event: RequestEvent, change: 'add' | 'remove', id?: string) {
	const body = await event.request.formData();
	const form = await superValidate(body, zod4(listingFormSchema), {
		errors: false,
		...(id ? { id } : {})
	});
	const rows =
		change === 'add'
			? withTierRowAdded(form.data)
			: withTierRowRemoved(form.data, Number(body.get('removeRow')));
	if (rows) {
		form.data.tierQuantity = rows.tierQuantity;
		form.data.tierPrice = rows.tierPrice;
	}
	return { form };
}
