export * from './conductors';
export * from './ampacity';
export * from './fuses';
export * from './batteries';
