export * from './auth';
export * from './clinics';
export * from './patients';
export * from './invitations';
export * from './audit';
export * from './recordings';
export * from './jobs';
export * from './captions';
