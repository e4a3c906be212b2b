/** The public face of the content: trials without their hidden errors, levels with trial titles. */
import type { PublicLevel, PublicTrial } from '../../shared/schemas';
import type { Content } from '../content/load';
import { effectiveDriveContent, publicDriveTrial } from './drive-content';

/** A trial as the content has it (its standard drift profile), without the hidden errors. */
export function publicTrial(content: Content, trialId: string): PublicTrial {
  return publicDriveTrial(content, effectiveDriveContent(content, trialId, null));
}

export interface TrialSummary {
  id: string;
  title: string;
  summary: string;
  robotName: string;
  timeLimit: number;
  levelIds: string[];
}

export function listTrials(content: Content): TrialSummary[] {
  return [...content.trials.values()].map((t) => ({
    id: t.id,
    title: t.title,
    summary: t.summary,
    robotName: content.robots.get(t.robotId)!.name,
    timeLimit: t.timeLimit,
    levelIds: content.levels.filter((l) => l.requiredTrials.includes(t.id)).map((l) => l.id),
  }));
}

export function listLevels(content: Content): PublicLevel[] {
  return content.levels.map((level) => ({
    ...level,
    trials: level.requiredTrials.map((id) => ({ id, title: content.trials.get(id)!.title })),
  }));
}
