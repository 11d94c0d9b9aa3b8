export * from './common';
export * from './battery';
export * from './cable';
export * from './passive';
export * from './loads';
export * from './registry';
export * from './presets';
