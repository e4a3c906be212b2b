// Entry of the alpha-fit worker thread: a worker does not inherit the TypeScript loader of
// `node --import tsx`, so it registers tsx itself and then runs the TypeScript module.
import { register } from 'tsx/esm/api';

register();
await import('./alpha-fit-thread.ts');
