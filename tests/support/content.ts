import { loadContent, type Content } from '../../server/content/load';

let cached: Content | undefined;
/** The shipped content, loaded once per test file. */
export function shippedContent(): Content {
  cached ??= loadContent();
  return cached;
}

/** Everything a DriveSim needs for a shipped trial. */
export function driveSetup(trialId: string, secretSeed: string) {
  const content = shippedContent();
  const trial = content.trials.get(trialId)!;
  const robot = content.robots.get(trial.robotId)!;
  return { trial, robot, surfaces: [...content.surfaces.values()], secretSeed };
}
