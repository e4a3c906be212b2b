/** The public face of the content: trials without their hidden errors, levels with trial titles. */
import type { PublicLevel, PublicTrial, RobotSummary, TrialSummary } from '../../shared/schemas';
import type { Content } from '../content/load';
import { effectiveDriveContent, publicDriveTrial } from './drive-content';

/** A trial as the content has it (its standard drift profile), without the hidden errors. */
export function publicTrial(content: Content, trialId: string): PublicTrial {
  return publicDriveTrial(content, effectiveDriveContent(content, trialId, null));
}

export function listTrials(content: Content): TrialSummary[] {
  return [...content.trials.values()].map((t) => ({
    id: t.id,
    title: t.title,
    summary: t.summary,
    robotId: t.robotId,
    robotName: content.robots.get(t.robotId)!.name,
    timeLimit: t.timeLimit,
    levelIds: content.levels.filter((l) => l.requiredTrials.includes(t.id)).map((l) => l.id),
  }));
}

export function listRobots(content: Content): RobotSummary[] {
  return [...content.robots.values()].map(({ id, name, description, wheelRadius, wheelbase, ticksPerRevolution }) => ({ id, name, description, wheelRadius, wheelbase, ticksPerRevolution }));
}

export function listLevels(content: Content): PublicLevel[] {
  return content.levels.map((level) => ({
    ...level,
    trials: level.requiredTrials.map((id) => ({ id, title: content.trials.get(id)!.title })),
  }));
}
