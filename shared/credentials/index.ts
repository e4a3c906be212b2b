export * from './number';
export * from './status';
