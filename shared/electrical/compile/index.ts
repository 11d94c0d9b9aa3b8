export * from './compile';
export * from './remainder';
