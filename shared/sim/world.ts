/**
 * A trial's site as the simulation queries it: which floor is under a point, whether a
 * footprint touches an obstacle, which anchor markers can be read, which call point is entered.
 * @module
 */
import { angleDifference, pointInPolygon, type Point2, type Pose } from '../motion';
import type { AnchorMarker, CallPoint, Robot, Surface, Trial } from '../schemas/content';
import { boundingBox, boxesOverlap, footprintAt, polygonsTouch, type Box } from './geometry';

interface IndexedObstacle {
  id: string;
  polygon: Point2[];
  box: Box;
}

/** The id reported for a footprint that leaves the map. */
export const MAP_EDGE = 'map-edge';

export class World {
  private readonly obstacles: IndexedObstacle[];
  private readonly zones: { polygon: Point2[]; box: Box; multiplier: number }[];

  constructor(
    readonly trial: Trial,
    readonly robot: Pick<Robot, 'footprint'>,
    surfaces: Surface[],
  ) {
    this.obstacles = trial.map.obstacles.map((o) => ({ id: o.id, polygon: o.polygon, box: boundingBox(o.polygon) }));
    const multiplier = new Map(surfaces.map((s) => [s.id, s.driftMultiplier]));
    // Later zones are drawn over earlier ones, so they are looked up first.
    this.zones = trial.zones
      .map((z) => ({ polygon: z.polygon, box: boundingBox(z.polygon), multiplier: multiplier.get(z.surfaceId) ?? 1 }))
      .reverse();
  }

  /** The drift multiplier of the floor at a point (1 where no zone is drawn). */
  driftMultiplierAt(x: number, y: number): number {
    for (const zone of this.zones) {
      if (x >= zone.box.minX && x <= zone.box.maxX && y >= zone.box.minY && y <= zone.box.maxY && pointInPolygon(x, y, zone.polygon)) {
        return zone.multiplier;
      }
    }
    return 1;
  }

  /** The footprint of the robot at a pose. */
  footprint(pose: Pose): Point2[] {
    return footprintAt(pose, this.robot.footprint.length, this.robot.footprint.width);
  }

  /** The id of the first obstacle the footprint at `pose` touches, MAP_EDGE outside the map, or null. */
  contactAt(pose: Pose): string | null {
    const corners = this.footprint(pose);
    const box = boundingBox(corners);
    if (box.minX < 0 || box.minY < 0 || box.maxX > this.trial.map.width || box.maxY > this.trial.map.height) return MAP_EDGE;
    for (const o of this.obstacles) {
      if (boxesOverlap(box, o.box) && polygonsTouch(corners, o.polygon)) return o.id;
    }
    return null;
  }

  /** Whether the robot at `pose` can read the marker: within its range and inside its viewing cone. */
  static canRead(marker: AnchorMarker, pose: Pose): boolean {
    const dx = pose.x - marker.x;
    const dy = pose.y - marker.y;
    if (dx * dx + dy * dy > marker.range * marker.range) return false;
    return Math.abs(angleDifference(Math.atan2(dy, dx), marker.facing)) <= marker.fov / 2;
  }

  /** Ids of the markers readable from `pose`, in content order. */
  markersInView(pose: Pose): string[] {
    return this.trial.markers.filter((m) => World.canRead(m, pose)).map((m) => m.id);
  }

  /** The first not yet answered call point whose trigger area holds the point. */
  callPointAt(pose: Pose, answered: ReadonlySet<string>): CallPoint | null {
    return this.trial.callPoints.find((c) => !answered.has(c.id) && pointInPolygon(pose.x, pose.y, c.trigger)) ?? null;
  }

  marker(id: string): AnchorMarker | undefined {
    return this.trial.markers.find((m) => m.id === id);
  }
}
