/**
 * Reads content/ (robots, surfaces, sites, trials, levels), validates every file with the shared
 * zod schemas, resolves each trial onto its site and checks the cross references. Any problem
 * stops start-up with the file, the JSON path and a message.
 */
import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import type { z } from 'zod';
import {
  levelSchema,
  robotSchema,
  siteSchema,
  surfacesFileSchema,
  resolveTrial,
  siteIssues,
  trialFileSchema,
  trialIssues,
  type Level,
  type Robot,
  type Site,
  type Surface,
  type Trial,
} from '../../shared/schemas';
import { PROJECT_ROOT } from '../config';

export interface Content {
  robots: Map<string, Robot>;
  surfaces: Map<string, Surface>;
  sites: Map<string, Site>;
  trials: Map<string, Trial>;
  levels: Level[];
  /** A hash per trial of everything a drive on it depends on; a replay refuses a changed trial. */
  trialHashes: Map<string, string>;
}

export class ContentError extends Error {
  constructor(readonly problems: string[]) {
    super(`The content is not valid:\n${problems.map((p) => `  - ${p}`).join('\n')}`);
  }
}

const jsonPath = (segments: PropertyKey[]) =>
  segments.reduce<string>((out, s) => (typeof s === 'number' ? `${out}[${s}]` : out ? `${out}.${String(s)}` : String(s)), '') || '(the whole file)';

export const DEFAULT_CONTENT_DIR = path.join(PROJECT_ROOT, 'content');

export function loadContent(dir = DEFAULT_CONTENT_DIR): Content {
  const problems: string[] = [];
  const relative = (file: string) => path.relative(path.dirname(dir), file);

  function read<S extends z.ZodType>(file: string, schema: S): z.infer<S> | undefined {
    let raw: unknown;
    try {
      raw = JSON.parse(readFileSync(file, 'utf8'));
    } catch (error) {
      problems.push(`${relative(file)}: not valid JSON (${(error as Error).message})`);
      return undefined;
    }
    const parsed = schema.safeParse(raw);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) problems.push(`${relative(file)}: ${jsonPath(issue.path)}: ${issue.message}`);
      return undefined;
    }
    return parsed.data;
  }

  /** Ids (file names) of files that failed their own checks: references to them say nothing more. */
  const broken = new Set<string>();

  function readFolder<S extends z.ZodType<{ id: string }>>(folder: string, schema: S): Map<string, { file: string; value: z.infer<S> }> {
    const out = new Map<string, { file: string; value: z.infer<S> }>();
    const full = path.join(dir, folder);
    if (!existsSync(full)) {
      problems.push(`${relative(full)}: folder missing`);
      return out;
    }
    for (const name of readdirSync(full).filter((n) => n.endsWith('.json')).sort()) {
      const file = path.join(full, name);
      const value = read(file, schema);
      if (!value) {
        broken.add(`${folder}/${name.replace(/\.json$/, '')}`);
        continue;
      }
      if (`${value.id}.json` !== name) problems.push(`${relative(file)}: id: "${value.id}" must match the file name`);
      out.set(value.id, { file, value });
    }
    return out;
  }

  const robots = readFolder('robots', robotSchema);
  const sites = readFolder('sites', siteSchema);
  const trialFiles = readFolder('trials', trialFileSchema);
  const levelFiles = readFolder('levels', levelSchema);
  const surfacesFile = path.join(dir, 'surfaces.json');
  const surfaceList = existsSync(surfacesFile) ? (read(surfacesFile, surfacesFileSchema)?.surfaces ?? []) : [];
  if (!existsSync(surfacesFile)) problems.push(`${relative(surfacesFile)}: file missing`);
  const surfaces = new Map(surfaceList.map((s) => [s.id, s]));

  const report = (file: string, issues: { path: PropertyKey[]; message: string }[]) => {
    for (const issue of issues) problems.push(`${relative(file)}: ${jsonPath(issue.path)}: ${issue.message}`);
  };
  const missing = (folder: string, id: string) => !broken.has(`${folder}/${id}`);

  for (const { file, value: site } of sites.values()) {
    report(file, siteIssues(site));
    site.zones.forEach((zone, i) => {
      if (!surfaces.has(zone.surfaceId)) problems.push(`${relative(file)}: zones[${i}].surfaceId: no surface "${zone.surfaceId}"`);
    });
  }

  const trials = new Map<string, Trial>();
  const trialHashes = new Map<string, string>();
  for (const { file, value: t } of trialFiles.values()) {
    const site = sites.get(t.siteId)?.value;
    const robot = robots.get(t.robotId)?.value;
    if (!site && missing('sites', t.siteId)) problems.push(`${relative(file)}: siteId: no site "${t.siteId}"`);
    if (!robot && missing('robots', t.robotId)) problems.push(`${relative(file)}: robotId: no robot "${t.robotId}"`);
    t.extraZones.forEach((zone, i) => {
      if (!surfaces.has(zone.surfaceId)) problems.push(`${relative(file)}: extraZones[${i}].surfaceId: no surface "${zone.surfaceId}"`);
    });
    if (!site || !robot) continue;
    report(file, trialIssues(t, site));
    const trial: Trial = resolveTrial(t, site);
    trials.set(trial.id, trial);
    const usedSurfaces = trial.zones.map((z) => surfaces.get(z.surfaceId));
    trialHashes.set(trial.id, createHash('sha256').update(JSON.stringify([trial, robot, usedSurfaces])).digest('hex').slice(0, 16));
  }

  const levels: Level[] = [];
  for (const { file, value: level } of levelFiles.values()) {
    level.requiredTrials.forEach((id, i) => {
      if (!trialFiles.has(id) && missing('trials', id)) problems.push(`${relative(file)}: requiredTrials[${i}]: no trial "${id}"`);
    });
    levels.push(level);
  }
  levels.sort((a, b) => a.order - b.order);

  if (problems.length) throw new ContentError(problems);
  return {
    robots: new Map([...robots].map(([k, v]) => [k, v.value])),
    surfaces,
    sites: new Map([...sites].map(([k, v]) => [k, v.value])),
    trials,
    levels,
    trialHashes,
  };
}
