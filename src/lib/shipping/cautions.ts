// The cautions shown beside a ship decision wherever it appears: the cart estimate,
// the keeper's order card and the ship-date e-mails. Live animals travel in a box, so
// the words on heat packs, the guarantee and the buyer's local rules go with every
// date. Plain data with no imports, so the mail templates can use it as well.

export type Caution = { title: string; text: string };

export const shippingCautions: readonly Readonly<Caution>[] = Object.freeze([
	Object.freeze({
		title: 'Heat packs in a sealed box',
		text: 'A heat pack can overheat a sealed box and kill what is inside. Every box that carries one is vented, with one pack per box size as the pack maker says, never more. If you ship animals yourself, do the same.'
	}),
	Object.freeze({
		title: 'Weather and the live-arrival guarantee',
		text: 'The live-arrival guarantee holds when the box ships on the date the shop chose from the forecast; no live animal is sent into extreme weather. A box held at a carrier facility for pickup must be collected the same day it arrives.'
	}),
	Object.freeze({
		title: "Your state's rules",
		text: "Moving some invertebrates between states needs a permit: in the US, USDA APHIS rules cover species that can be plant pests. The shop holds the permits for what it ships; checking your own state's rules on receiving the species is up to you, and they come first."
	})
]);
