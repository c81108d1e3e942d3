/** Follow-up: the caseload, a patient's figures and range-of-motion readings, the weekly digest. */
export * from './caseload';
export * from './patient';
export * from './digest';
export { clinicPatients, figureInput, loadRecords } from './records';
