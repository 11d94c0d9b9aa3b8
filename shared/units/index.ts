export * from './length';
export * from './temperature';
export * from './conductor';
export * from './parse';
export * from './format';
