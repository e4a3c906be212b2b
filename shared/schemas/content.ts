/**
 * The shape of the content files (content/robots, content/surfaces.json, content/trials,
 * content/levels). The server validates every file against these at start-up and in the tests;
 * the client uses the inferred types of the public parts.
 */
import { z } from 'zod';

const id = z.string().regex(/^[a-z0-9][a-z0-9-]{1,63}$/, 'Use 2–64 lower-case letters, digits and dashes.');
const positive = z.number().positive('Must be greater than zero.');
const finite = z.number().refine(Number.isFinite, 'Must be a finite number.');

export const pointSchema = z.strictObject({ x: finite, y: finite });
export type Point = z.infer<typeof pointSchema>;

export const poseSchema = z.strictObject({
  x: finite,
  y: finite,
  theta: finite.refine((t) => t > -Math.PI - 1e-9 && t <= Math.PI + 1e-9, 'Use a heading in (-pi, pi] radians.'),
});

export const polygonSchema = z.array(pointSchema).min(3, 'A polygon needs at least 3 points.').max(200);
export const pathSchema = z.array(pointSchema).min(2, 'A path needs at least 2 points.').max(100);

/** Odometry-model noise a1..a4 in variance form (see shared/motion/README.md). */
export const odometryAlphasSchema = z.tuple([z.number().min(0), z.number().min(0), z.number().min(0), z.number().min(0)]);

export const systematicErrorsSchema = z.strictObject({
  ed: z.number().min(0.9, 'Ed is a ratio close to 1.').max(1.1, 'Ed is a ratio close to 1.'),
  eb: z.number().min(0.8, 'Eb is a ratio close to 1.').max(1.2, 'Eb is a ratio close to 1.'),
});

/** A drift profile: odometry-model alphas plus the systematic Ed and Eb. */
export const driftProfileSchema = z.strictObject({ alphas: odometryAlphasSchema }).extend(systematicErrorsSchema.shape);
export type DriftProfile = z.infer<typeof driftProfileSchema>;

export const robotSchema = z.strictObject({
  id,
  name: z.string().min(1).max(80),
  description: z.string().max(500),
  wheelRadius: positive.max(1),
  wheelbase: positive.max(3),
  ticksPerRevolution: z.number().int().min(16).max(1_000_000),
  footprint: z.strictObject({ length: positive.max(5), width: positive.max(5) }),
  limits: z.strictObject({
    maxSpeed: positive.max(5),
    maxReverseSpeed: z.number().min(0).max(5),
    maxTurnRate: positive.max(6),
    maxAcceleration: positive.max(10),
    maxTurnAcceleration: positive.max(20),
  }),
  /** Seconds between two commands. */
  controlPeriod: z.number().min(0.02).max(0.5),
  /** Speed of a creep pass, m/s. */
  creepSpeed: positive.max(1),
  /** The drift profile the robot's software assumes (public: the drift cloud is drawn with it). */
  assumedProfile: driftProfileSchema,
  /** The robot's real systematic errors; stay on the server. */
  hiddenErrors: systematicErrorsSchema,
});
export type Robot = z.infer<typeof robotSchema>;

export const surfaceSchema = z.strictObject({
  id,
  name: z.string().min(1).max(60),
  /** Scales the alphas of the robot's drift on this floor (1 = the dry, even floor the profile was made on). */
  driftMultiplier: z.number().min(0.1).max(50),
  description: z.string().max(300),
});
export type Surface = z.infer<typeof surfaceSchema>;
export const surfacesFileSchema = z.strictObject({ note: z.string(), surfaces: z.array(surfaceSchema).min(1) });

export const OBSTACLE_KINDS = ['wall', 'rack', 'charger', 'pillar', 'barrier', 'equipment'] as const;

export const obstacleSchema = z.strictObject({
  id,
  kind: z.enum(OBSTACLE_KINDS),
  label: z.string().max(60).optional(),
  polygon: polygonSchema,
});

export const floorZoneSchema = z.strictObject({ id, surfaceId: id, label: z.string().max(60).optional(), polygon: polygonSchema });

export const anchorMarkerSchema = z.strictObject({
  id,
  x: finite,
  y: finite,
  /** Direction the marker faces, radians; it can be seen from within fov/2 of it. */
  facing: finite,
  /** Metres within which the robot can read it. */
  range: positive.max(30),
  /** Full opening angle, radians. */
  fov: z.number().positive().max(2 * Math.PI),
  /** Standard deviations of a re-localisation on this marker: metres, metres, radians. */
  noise: z.strictObject({ position: z.number().min(0).max(0.5), heading: z.number().min(0).max(0.5) }),
});

export const callPointSchema = z.strictObject({
  id,
  label: z.string().min(1).max(80),
  /** Entering this area with the odometry pose stops the drive for a call. */
  trigger: polygonSchema,
  /** The path the robot takes through the gap after proceed or creep (odometry frame). */
  passPath: pathSchema,
  /** Whether the operator must place an estimate pin before the call. */
  askEstimate: z.boolean(),
  hint: z.string().max(300).optional(),
});

export const CALLS = ['proceed', 'creep', 'reanchor', 'halt'] as const;
export const callSchema = z.enum(CALLS);
export type Call = z.infer<typeof callSchema>;

export const rubricSchema = z.strictObject({
  /** Risk band edges (share of the drift cloud that touches an obstacle on the pass): low < first ≤ mid < second ≤ high. */
  riskBands: z.tuple([z.number().gt(0).lt(1), z.number().gt(0).lt(1)]).refine(([a, b]) => a < b, 'The first band edge must be below the second.'),
  /** Points per call grade. */
  gradePoints: z.strictObject({ sound: z.number(), acceptable: z.number(), overCautious: z.number(), risky: z.number(), unsafe: z.number() }),
  weights: z.strictObject({ calls: z.number().min(0), estimates: z.number().min(0), docking: z.number().min(0), time: z.number().min(0) }),
  passMark: z.number().min(0).max(100),
  review: z.enum(['always', 'failed', 'none']),
  /** Seconds added by a halt (assisted recovery) and by a re-anchor detour. */
  haltSeconds: z.number().min(0).max(3600),
  reanchorSeconds: z.number().min(0).max(3600),
  /** A total this close to the pass mark (points), or a call risk this close to a band edge (share), goes to review. */
  reviewMargins: z.strictObject({ total: z.number().min(0).max(50), risk: z.number().min(0).max(0.5) }),
});

export const siteSchema = z.strictObject({
  id,
  name: z.string().min(1).max(100),
  description: z.string().max(1000),
  width: positive.max(500),
  height: positive.max(500),
  obstacles: z.array(obstacleSchema),
  zones: z.array(floorZoneSchema),
  markers: z.array(anchorMarkerSchema),
});
export type Site = z.infer<typeof siteSchema>;

/** A trial file: a drive task on a site, with what it adds to the site. */
export const trialFileSchema = z.strictObject({
  id,
  title: z.string().min(1).max(100),
  summary: z.string().min(1).max(300),
  briefing: z.string().min(1).max(4000),
  robotId: id,
  siteId: id,
  /** Overrides the robot's hidden systematic errors for this trial. */
  hiddenErrors: systematicErrorsSchema.optional(),
  extraObstacles: z.array(obstacleSchema),
  extraZones: z.array(floorZoneSchema),
  start: poseSchema,
  /** The way the operator is asked to drive, start to dock, as a polyline. */
  route: pathSchema,
  dock: z.strictObject({ pose: poseSchema, positionTolerance: positive.max(2), headingTolerance: positive.max(Math.PI) }),
  callPoints: z.array(callPointSchema).min(1, 'A trial needs at least one call point.'),
  timeLimit: z.number().int().min(30).max(7200),
  rubric: rubricSchema,
});
export type TrialFile = z.infer<typeof trialFileSchema>;

/** A trial with its site resolved: the map it is driven on, floor zones and markers included. */
export interface Trial extends Omit<TrialFile, 'extraObstacles' | 'extraZones'> {
  siteName: string;
  map: { width: number; height: number; obstacles: z.infer<typeof obstacleSchema>[] };
  zones: z.infer<typeof floorZoneSchema>[];
  markers: z.infer<typeof anchorMarkerSchema>[];
}
export type Obstacle = Trial['map']['obstacles'][number];
export type FloorZone = Trial['zones'][number];
export type AnchorMarker = Trial['markers'][number];
export type CallPoint = Trial['callPoints'][number];
export type Rubric = Trial['rubric'];

export interface ContentIssue {
  path: (string | number)[];
  message: string;
}

const inMapOf = (map: { width: number; height: number }) => (p: { x: number; y: number }) => p.x >= 0 && p.y >= 0 && p.x <= map.width && p.y <= map.height;

function duplicateIds(items: { id: string }[], path: string, what: string, taken: Set<string> = new Set()): ContentIssue[] {
  const issues: ContentIssue[] = [];
  items.forEach((item, i) => {
    if (taken.has(item.id)) issues.push({ path: [path, i, 'id'], message: `Two ${what} share the id "${item.id}".` });
    taken.add(item.id);
  });
  return issues;
}

/** What a schema alone cannot see in a site file: repeated ids, markers off the map. */
export function siteIssues(site: Site): ContentIssue[] {
  const inMap = inMapOf(site);
  return [
    ...duplicateIds(site.obstacles, 'obstacles', 'obstacles'),
    ...duplicateIds(site.zones, 'zones', 'floor zones'),
    ...duplicateIds(site.markers, 'markers', 'markers'),
    ...site.markers.flatMap((m, i) => (inMap(m) ? [] : [{ path: ['markers', i], message: 'The marker is outside the map.' }])),
  ];
}

/** What a schema alone cannot see in a trial file on its site: poses and paths off the map, repeated ids. */
export function trialIssues(trial: TrialFile, site: Site): ContentIssue[] {
  const inMap = inMapOf(site);
  const issues: ContentIssue[] = [];
  if (!inMap(trial.start)) issues.push({ path: ['start'], message: 'The start pose is outside the map.' });
  if (!inMap(trial.dock.pose)) issues.push({ path: ['dock', 'pose'], message: 'The dock is outside the map.' });
  trial.route.forEach((p, i) => {
    if (!inMap(p)) issues.push({ path: ['route', i], message: 'The route leaves the map.' });
  });
  trial.callPoints.forEach((c, i) => {
    c.passPath.forEach((p, j) => {
      if (!inMap(p)) issues.push({ path: ['callPoints', i, 'passPath', j], message: 'The pass path leaves the map.' });
    });
  });
  issues.push(...duplicateIds(trial.extraObstacles, 'extraObstacles', 'obstacles', new Set(site.obstacles.map((o) => o.id))));
  issues.push(...duplicateIds(trial.extraZones, 'extraZones', 'floor zones', new Set(site.zones.map((z) => z.id))));
  issues.push(...duplicateIds(trial.callPoints, 'callPoints', 'call points'));
  return issues;
}

/** A trial file placed on its site: the map, floor zones and markers it is driven with. */
export function resolveTrial(file: TrialFile, site: Site): Trial {
  const { extraObstacles, extraZones, ...rest } = file;
  return {
    ...rest,
    siteName: site.name,
    map: { width: site.width, height: site.height, obstacles: [...site.obstacles, ...extraObstacles] },
    zones: [...site.zones, ...extraZones],
    markers: site.markers,
  };
}

export const levelSchema = z.strictObject({
  id,
  name: z.string().min(1).max(80),
  order: z.number().int().min(1),
  description: z.string().min(1).max(1000),
  requiredTrials: z.array(id).min(1),
  validityMonths: z.number().int().min(1).max(120),
  review: z.enum(['always', 'failed', 'none']),
});
export type Level = z.infer<typeof levelSchema>;

/** What the client gets of a trial: everything but the hidden errors. */
export type PublicRobot = Omit<Robot, 'hiddenErrors'>;
export type PublicTrial = Omit<Trial, 'hiddenErrors'> & { robot: PublicRobot; surfaces: Surface[] };

/** A trial as GET /api/trials lists it. */
export interface TrialSummary {
  id: string;
  title: string;
  summary: string;
  robotId: string;
  robotName: string;
  /** Seconds. */
  timeLimit: number;
  levelIds: string[];
}

/** A content robot as GET /api/robots lists it: its nominal geometry, never its hidden errors. */
export type RobotSummary = Pick<Robot, 'id' | 'name' | 'description' | 'wheelRadius' | 'wheelbase' | 'ticksPerRevolution'>;

/** A level as the client sees it, with the titles of its trials. */
export type PublicLevel = Level & { trials: { id: string; title: string }[] };
