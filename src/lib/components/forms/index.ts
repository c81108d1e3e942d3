export { default as Field, type FieldControl } from './Field.svelte';
export { default as FieldGroup } from './FieldGroup.svelte';
export { default as FormProblems } from './FormProblems.svelte';
export { default as NewPasswordFields } from './NewPasswordFields.svelte';
export { default as ProblemList } from './ProblemList.svelte';
