/**
 * The content loader: the shipped content loads, and a broken copy of it is rejected with one
 * line per problem naming the file, the JSON path and what is wrong.
 *
 * Each broken case copies content/ into a fresh temporary folder (under .data/tmp, removed after
 * the test) as `<tmp>/content`, so the file names in the messages read "content/…".
 */
import { cpSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { ContentError, DEFAULT_CONTENT_DIR, loadContent } from '../../../server/content/load';
import { PROJECT_ROOT } from '../../../server/config';

const TMP_ROOT = path.join(PROJECT_ROOT, '.data', 'tmp');
const made: string[] = [];

afterEach(() => {
  while (made.length) rmSync(made.pop()!, { recursive: true, force: true });
});

/** A fresh copy of the shipped content; returns its folder (named `content`). */
function copyContent(): string {
  mkdirSync(TMP_ROOT, { recursive: true });
  const tmp = mkdtempSync(path.join(TMP_ROOT, 'content-test-'));
  made.push(tmp);
  const dir = path.join(tmp, 'content');
  cpSync(DEFAULT_CONTENT_DIR, dir, { recursive: true });
  return dir;
}

type Json = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any

/** Reads a JSON file of the copy, lets `change` edit it, writes it back. */
function edit(dir: string, file: string, change: (json: Json) => void): void {
  const full = path.join(dir, file);
  const json = JSON.parse(readFileSync(full, 'utf8')) as Json;
  change(json);
  writeFileSync(full, JSON.stringify(json, null, 2));
}

/** The problems loadContent reports for `dir` (fails the test if it loads). */
function problemsOf(dir: string): string[] {
  try {
    loadContent(dir);
  } catch (error) {
    expect(error).toBeInstanceOf(ContentError);
    const problems = (error as ContentError).problems;
    // The error's message lists every problem, so start-up logs show them all.
    for (const p of problems) expect((error as Error).message).toContain(p);
    return problems;
  }
  expect.fail('loadContent accepted broken content');
}

const ALL_TRIALS = ['charging-bay-pass', 'dock-door-three', 'long-aisle-run', 'rack-end-slalom', 'uncalibrated-rover', 'wash-bay-crossing'];

describe('shipped content', () => {
  it('loads: 3 robots, 6 trials, 3 levels in order, every level naming trials that exist', () => {
    const content = loadContent();
    expect([...content.robots.keys()].sort()).toEqual(['aisle-tugger', 'inspection-rover', 'pallet-mover']);
    expect([...content.trials.keys()].sort()).toEqual(ALL_TRIALS);
    expect(content.levels.map((l) => l.id)).toEqual(['aisle-operator', 'floor-and-dock', 'drift-judgement']);
    expect(content.levels.map((l) => l.order)).toEqual([1, 2, 3]);
    for (const level of content.levels) {
      for (const id of level.requiredTrials) expect(content.trials.has(id), `${level.id} → ${id}`).toBe(true);
    }
    // Every trial is required by some level.
    const required = new Set(content.levels.flatMap((l) => l.requiredTrials));
    expect([...required].sort()).toEqual(ALL_TRIALS);
  });

  it('resolves each trial onto its site, with its robot and surfaces known', () => {
    const content = loadContent();
    const site = content.sites.get('tessel-row-hall')!;
    for (const trial of content.trials.values()) {
      expect(content.robots.has(trial.robotId)).toBe(true);
      expect(trial.siteName).toBe(site.name);
      expect(trial.map.width).toBe(site.width);
      expect(trial.map.obstacles.length).toBeGreaterThanOrEqual(site.obstacles.length);
      expect(trial.markers).toEqual(site.markers);
      for (const zone of trial.zones) expect(content.surfaces.has(zone.surfaceId)).toBe(true);
    }
    // uncalibrated-rover adds its two parked carts to the site's obstacles.
    const rover = content.trials.get('uncalibrated-rover')!;
    expect(rover.map.obstacles.map((o) => o.id).slice(-2)).toEqual(['cart-aisle-3', 'cart-aisle-3-b']);
  });

  it('gives each trial a stable hash of what a drive depends on, different per trial', () => {
    const a = loadContent();
    const b = loadContent();
    expect([...a.trialHashes.keys()].sort()).toEqual(ALL_TRIALS);
    expect(new Set(a.trialHashes.values()).size).toBe(6);
    expect([...b.trialHashes]).toEqual([...a.trialHashes]);
  });

  it('a copy of the content loads the same as the original (the test copies are sound)', () => {
    const copy = loadContent(copyContent());
    expect([...copy.trialHashes]).toEqual([...loadContent().trialHashes]);
  });

  it('a trial changed in its copy changes its hash only', () => {
    const dir = copyContent();
    edit(dir, 'trials/long-aisle-run.json', (t) => {
      t.timeLimit = 250;
    });
    const changed = loadContent(dir).trialHashes;
    const original = loadContent().trialHashes;
    for (const id of ALL_TRIALS) {
      if (id === 'long-aisle-run') expect(changed.get(id)).not.toBe(original.get(id));
      else expect(changed.get(id)).toBe(original.get(id));
    }
  });
});

describe('broken content is rejected with file, JSON path and message', () => {
  it('a robot missing a required field (the trial that uses it says nothing more)', () => {
    const dir = copyContent();
    edit(dir, 'robots/inspection-rover.json', (r) => {
      delete r.wheelbase;
    });
    expect(problemsOf(dir)).toEqual([
      'content/robots/inspection-rover.json: wheelbase: Invalid input: expected number, received undefined',
    ]);
  });

  it('a missing field deep in a robot is named by its full path', () => {
    const dir = copyContent();
    edit(dir, 'robots/pallet-mover.json', (r) => {
      delete r.limits.maxTurnRate;
    });
    expect(problemsOf(dir)).toContain('content/robots/pallet-mover.json: limits.maxTurnRate: Invalid input: expected number, received undefined');
  });

  it('a site obstacle whose polygon has two points (the trials on the site say nothing more)', () => {
    const dir = copyContent();
    edit(dir, 'sites/tessel-row-hall.json', (s) => {
      s.obstacles[4].polygon = s.obstacles[4].polygon.slice(0, 2);
    });
    expect(problemsOf(dir)).toEqual(['content/sites/tessel-row-hall.json: obstacles[4].polygon: A polygon needs at least 3 points.']);
  });

  it('the dock outside the map', () => {
    const dir = copyContent();
    edit(dir, 'trials/long-aisle-run.json', (t) => {
      t.dock.pose.x = 48.5; // the hall is 48 m wide
    });
    expect(problemsOf(dir)).toEqual(['content/trials/long-aisle-run.json: dock.pose: The dock is outside the map.']);
  });

  it('a route point and a pass-path point outside the map', () => {
    const dir = copyContent();
    edit(dir, 'trials/charging-bay-pass.json', (t) => {
      t.route[2].y = -1;
      t.callPoints[0].passPath[1].x = 60;
    });
    expect(problemsOf(dir)).toEqual([
      'content/trials/charging-bay-pass.json: route[2]: The route leaves the map.',
      'content/trials/charging-bay-pass.json: callPoints[0].passPath[1]: The pass path leaves the map.',
    ]);
  });

  it('a call point without a pass path (the levels that require the trial say nothing more)', () => {
    const dir = copyContent();
    edit(dir, 'trials/long-aisle-run.json', (t) => {
      delete t.callPoints[0].passPath;
    });
    // An invalid trial counts as missing for the levels that require it.
    expect(problemsOf(dir)).toEqual([
      'content/trials/long-aisle-run.json: callPoints[0].passPath: Invalid input: expected array, received undefined',
    ]);
  });

  it('a call point whose pass path has one point', () => {
    const dir = copyContent();
    edit(dir, 'trials/rack-end-slalom.json', (t) => {
      t.callPoints[0].passPath = [t.callPoints[0].passPath[0]];
    });
    expect(problemsOf(dir)).toEqual([
      'content/trials/rack-end-slalom.json: callPoints[0].passPath: A path needs at least 2 points.',
    ]);
  });

  it('a trial naming an unknown robot', () => {
    const dir = copyContent();
    edit(dir, 'trials/dock-door-three.json', (t) => {
      t.robotId = 'forklift-x';
    });
    expect(problemsOf(dir)).toEqual(['content/trials/dock-door-three.json: robotId: no robot "forklift-x"']);
  });

  it('a site zone naming an unknown surface', () => {
    const dir = copyContent();
    edit(dir, 'sites/tessel-row-hall.json', (s) => {
      s.zones[1].surfaceId = 'black-ice';
    });
    expect(problemsOf(dir)).toEqual(['content/sites/tessel-row-hall.json: zones[1].surfaceId: no surface "black-ice"']);
  });

  it('a trial zone naming an unknown surface', () => {
    const dir = copyContent();
    edit(dir, 'trials/wash-bay-crossing.json', (t) => {
      t.extraZones.push({ id: 'spill', surfaceId: 'oil-film', polygon: [{ x: 30, y: 27 }, { x: 32, y: 27 }, { x: 32, y: 28 }] });
    });
    expect(problemsOf(dir)).toEqual(['content/trials/wash-bay-crossing.json: extraZones[0].surfaceId: no surface "oil-film"']);
  });

  it('a level naming an unknown trial', () => {
    const dir = copyContent();
    edit(dir, 'levels/aisle-operator.json', (l) => {
      l.requiredTrials[1] = 'rack-end-slalom-2';
    });
    expect(problemsOf(dir)).toEqual(['content/levels/aisle-operator.json: requiredTrials[1]: no trial "rack-end-slalom-2"']);
  });

  it('a file that is not valid JSON', () => {
    const dir = copyContent();
    const text = readFileSync(path.join(dir, 'levels/floor-and-dock.json'), 'utf8').replace('"order": 2,', '"order": 2,,');
    writeFileSync(path.join(dir, 'levels/floor-and-dock.json'), text);
    // The parser's own wording (it differs between Node versions), taken from the same parser.
    let parserMessage = '';
    try {
      JSON.parse(text);
    } catch (error) {
      parserMessage = (error as Error).message;
    }
    expect(parserMessage).not.toBe('');
    expect(problemsOf(dir)).toEqual([`content/levels/floor-and-dock.json: not valid JSON (${parserMessage})`]);
  });

  it('an unknown extra field at the top of a file and deep inside one (objects are strict)', () => {
    const dir = copyContent();
    edit(dir, 'robots/aisle-tugger.json', (r) => {
      r.colour = 'yellow';
    });
    edit(dir, 'trials/long-aisle-run.json', (t) => {
      t.callPoints[0].speedLimit = 0.5;
    });
    const problems = problemsOf(dir);
    expect(problems).toContain('content/robots/aisle-tugger.json: (the whole file): Unrecognized key: "colour"');
    expect(problems).toContain('content/trials/long-aisle-run.json: callPoints[0]: Unrecognized key: "speedLimit"');
  });

  it('an id that does not match its file name', () => {
    const dir = copyContent();
    edit(dir, 'levels/floor-and-dock.json', (l) => {
      l.id = 'floors-and-docking';
    });
    expect(problemsOf(dir)).toEqual(['content/levels/floor-and-dock.json: id: "floors-and-docking" must match the file name']);
  });

  it('two obstacles with the same id are rejected, naming the id', () => {
    const dir = copyContent();
    edit(dir, 'sites/tessel-row-hall.json', (s) => {
      s.obstacles[5].id = 'rack-a';
    });
    const problems = problemsOf(dir);
    expect(problems.length).toBeGreaterThan(0);
    for (const p of problems) expect(p).toMatch(/: Two obstacles share the id "rack-a"\.$/);
  });

  it('two obstacles with the same id in a site are reported against the site file', () => {
    const dir = copyContent();
    edit(dir, 'sites/tessel-row-hall.json', (s) => {
      s.obstacles[5].id = 'rack-a';
    });
    expect(problemsOf(dir)).toEqual(['content/sites/tessel-row-hall.json: obstacles[5].id: Two obstacles share the id "rack-a".']);
  });

  it('an extra obstacle repeating a site obstacle id is reported at its path in the trial file', () => {
    const dir = copyContent();
    edit(dir, 'trials/uncalibrated-rover.json', (t) => {
      t.extraObstacles[0].id = 'rack-c';
    });
    expect(problemsOf(dir)).toEqual(['content/trials/uncalibrated-rover.json: extraObstacles[0].id: Two obstacles share the id "rack-c".']);
  });

  it('several problems in several files are all reported at once', () => {
    const dir = copyContent();
    edit(dir, 'trials/long-aisle-run.json', (t) => {
      t.dock.pose.y = 31;
    });
    edit(dir, 'levels/drift-judgement.json', (l) => {
      l.validityMonths = 0;
    });
    const problems = problemsOf(dir);
    expect(problems).toHaveLength(2);
    expect(problems).toContain('content/trials/long-aisle-run.json: dock.pose: The dock is outside the map.');
    expect(problems.find((p) => p.startsWith('content/levels/drift-judgement.json: validityMonths: '))).toBeDefined();
  });

  it('a missing folder and a missing surfaces file', () => {
    const dir = copyContent();
    rmSync(path.join(dir, 'levels'), { recursive: true });
    rmSync(path.join(dir, 'surfaces.json'));
    const problems = problemsOf(dir);
    expect(problems).toContain('content/levels: folder missing');
    expect(problems).toContain('content/surfaces.json: file missing');
  });
});
