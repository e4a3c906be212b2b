import type { Migration } from '../migrate';
import { demoOrganization, type DemoOptions } from './0001-demo-organization';
import { demoExamSeats } from './0002-demo-exam-seats';
import { demoFleetProfile } from './0003-demo-fleet-profile';

export type { DemoOptions };

/** Demo data, in order. They run once, and only on a database without users. */
export function demoSeeders(options: DemoOptions): Migration[] {
  return [demoOrganization(options), demoExamSeats, demoFleetProfile];
}
