export * from '../electrical/document/schema';
export * from './parse';
export * from './templates';
