// Every migration, by name, in order. Imported statically so the same list works
// under tsx, Vitest and the bundler; a test checks it matches the folder.
import type { Migration } from 'kysely';
import * as dataModelV1 from './2026-12-01T2200_data_model_v1';
import * as accountsMailLimits from './2026-12-01T2300_accounts_mail_limits';
import * as backOffice from './2026-12-02T0100_back_office';
import * as shopAndCart from './2026-12-02T0500_shop_and_cart';
import * as catalogueOfferPlans from './2026-12-02T0600_catalogue_offer_plans';
import * as fulfilment from './2026-12-02T0800_fulfilment';
import * as reportIndexes from './2026-12-02T1200_report_indexes';

export const migrations: Record<string, Migration> = {
	'2026-12-01T2200_data_model_v1': dataModelV1,
	'2026-12-01T2300_accounts_mail_limits': accountsMailLimits,
	'2026-12-02T0100_back_office': backOffice,
	'2026-12-02T0500_shop_and_cart': shopAndCart,
	'2026-12-02T0600_catalogue_offer_plans': catalogueOfferPlans,
	'2026-12-02T0800_fulfilment': fulfilment,
	'2026-12-02T1200_report_indexes': reportIndexes
};
