export * from './registry';
export * from './rules';
