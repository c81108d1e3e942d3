/** Clinical computations for programmes and follow-up (pure; server and browser). */
export * from './calendar';
export * from './phases';
export * from './precautions';
export * from './adherence';
export * from './pain';
export * from './rom';
