// Ids and versions as a form posts them. PostgreSQL's integer columns hold up to
// 2,147,483,647 (its documentation, "Numeric Types"); a larger number makes the lookup
// fail instead of find nothing, so a form schema refuses it first.
export const MAX_INTEGER_COLUMN = 2_147_483_647;

/** The sentence for an id no row can have (a hidden field someone edited). */
export const NO_SUCH_ROW = 'That is not one of ours; reload the page.';
