export * from './schema';
export * from './csv';
