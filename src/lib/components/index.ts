// Hatchlot's shared UI. Import from '$lib/components'.
export { default as Button } from './Button.svelte';
export { default as Card } from './Card.svelte';
export { default as DataTable, type Column } from './DataTable.svelte';
export { default as EmptyState } from './EmptyState.svelte';
export { default as Field, type FieldControl } from './Field.svelte';
export { default as FormCheckboxField } from './FormCheckboxField.svelte';
export { default as FormTextField } from './FormTextField.svelte';
export { default as Icon } from './Icon.svelte';
export { default as Money } from './Money.svelte';
export { default as Notice } from './Notice.svelte';
export { default as OfficeFrame } from './OfficeFrame.svelte';
export { default as PageHeader } from './PageHeader.svelte';
export { default as StateBadge } from './StateBadge.svelte';
export { default as Temperature } from './Temperature.svelte';
export { default as Wordmark } from './Wordmark.svelte';
export { icons, type IconName } from './icons';
export { stateLook, stateLooks, toneClasses, type StateLook, type Tone } from './state-look';
