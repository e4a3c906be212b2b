import { foundation } from './0001-foundation';

/** Every schema change, in order. Add new ones at the end; never edit one that has shipped. */
export const migrations = [foundation];
