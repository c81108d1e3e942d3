export { default as Field, type FieldControl } from './Field.svelte';
export { default as FormProblems } from './FormProblems.svelte';
