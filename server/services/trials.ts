/** The public face of the content: trials without their hidden errors, levels with trial titles. */
import type { PublicLevel, PublicTrial } from '../../shared/schemas';
import type { Content } from '../content/load';
import { notFound } from '../http/errors';

export function publicTrial(content: Content, trialId: string): PublicTrial {
  const trial = content.trials.get(trialId);
  if (!trial) throw notFound('That trial');
  const { hiddenErrors: _trialErrors, ...rest } = trial;
  const { hiddenErrors: _robotErrors, ...robot } = content.robots.get(trial.robotId)!;
  const surfaceIds = new Set(trial.zones.map((z) => z.surfaceId));
  const surfaces = [...content.surfaces.values()].filter((s) => surfaceIds.has(s.id) || s.driftMultiplier === 1);
  return { ...rest, robot, surfaces };
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
