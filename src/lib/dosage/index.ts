/** Dosage: the vocabulary, its schemas and the sums made from it (pure; server and browser). */
export * from './types';
export * from './schema';
export * from './volume';
export * from './minutes';
export * from './progression';
export * from './bounds';
export * from './defaults';
export * from './describe';
