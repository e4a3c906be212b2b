import { foundation } from './0001-foundation';
import { attempts } from './0002-attempts';
import { scoresAndReviews } from './0003-scores-and-reviews';
import { employers } from './0004-employers';
import { credentials } from './0005-credentials';
import { fleetProfiles } from './0006-fleet-profiles';

/** Every schema change, in order. Add new ones at the end; never edit one that has shipped. */
export const migrations = [foundation, attempts, scoresAndReviews, employers, credentials, fleetProfiles];
