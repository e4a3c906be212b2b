export * from './roles';
export * from './fields';
export * from './auth';
export * from './users';
export * from './mail';
export * from './errors';
export * from './organizations';
export * from './content';
