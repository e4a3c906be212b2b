/** Small rules of the practice-trial lists (employer's choice and operator's list). */
import type { FleetPracticeTrial } from '@shared/schemas';
import type { TrialSummary } from '@/api';

/**
 * The trials a profile can run on: those driven by the profile's robot model (a fleet profile
 * replaces the drift of one robot model), by title.
 */
export function trialsForRobot(trials: readonly TrialSummary[], robotId: string): TrialSummary[] {
  return trials.filter((t) => t.robotId === robotId).sort((a, b) => a.title.localeCompare(b.title));
}

/** Whether two lists hold the same trial ids, in any order. */
export function sameTrialIds(a: readonly string[], b: readonly string[]): boolean {
  if (a.length !== b.length) return false;
  const set = new Set(a);
  return b.every((id) => set.has(id));
}

/** The operator's fleet practice trials grouped by profile (profiles by name, trials by title). */
export function groupByProfile(items: readonly FleetPracticeTrial[]): { profileId: string; profileName: string; trials: FleetPracticeTrial[] }[] {
  const groups = new Map<string, { profileId: string; profileName: string; trials: FleetPracticeTrial[] }>();
  for (const item of items) {
    let group = groups.get(item.fleetProfileId);
    if (!group) {
      group = { profileId: item.fleetProfileId, profileName: item.fleetProfileName, trials: [] };
      groups.set(item.fleetProfileId, group);
    }
    group.trials.push(item);
  }
  const list = [...groups.values()].sort((a, b) => a.profileName.localeCompare(b.profileName));
  for (const g of list) g.trials.sort((a, b) => a.trialTitle.localeCompare(b.trialTitle));
  return list;
}
