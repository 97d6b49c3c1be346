// A ship-check result as a visitor sees it at the cart: the decision, each fired rule
// with its sentence, and the cautions that go with any ship date. Pure.
import type { IsoDate } from '$lib/format/dates';
import { shippingCautions, type Caution } from './cautions';
import { describeReason } from './reasons';
import type { Pack, Reason, ShipCheckResult } from './ship-check';

export type DescribedReason = Reason & { text: string };

export type ShipEstimate = {
	decision: 'ship' | 'hold';
	shipDate: IsoDate | null;
	deliveryDate: IsoDate | null;
	/** For a hold, the day the shop looks at the forecast again. */
	recheckDate: IsoDate | null;
	packs: Pack[];
	facilityPickup: boolean;
	reasons: DescribedReason[];
	cautions: Caution[];
};

export function describeReasons(reasons: readonly Reason[]): DescribedReason[] {
	return reasons.map((reason) => ({ ...reason, text: describeReason(reason) }));
}

export function shipEstimateOf(result: ShipCheckResult): ShipEstimate {
	const cautions = shippingCautions.map((caution) => ({ ...caution }));
	if (result.decision === 'ship') {
		return {
			decision: 'ship',
			shipDate: result.shipDate,
			deliveryDate: result.deliveryDate,
			recheckDate: null,
			packs: [...result.packs],
			facilityPickup: result.facilityPickup,
			reasons: describeReasons(result.reasons),
			cautions
		};
	}
	return {
		decision: 'hold',
		shipDate: null,
		deliveryDate: null,
		recheckDate: result.recheckDate,
		packs: [],
		facilityPickup: false,
		reasons: describeReasons(result.reasons),
		cautions
	};
}
