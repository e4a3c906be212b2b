/**
 * Draws the static part of a trial's map on a canvas already transformed to world metres (y up):
 * floor and grid, floor zones (tint and hatch), the route, call point triggers and their pass
 * paths, the dock, the anchor markers with their viewing cones, and the obstacles. One call per
 * redraw; widths are given in pixels and divided by the zoom.
 */
import type { PublicTrial } from '@shared/schemas';
import { INK, OBSTACLE_LOOKS, drawHatch, surfaceLook } from './map-style';

interface Point {
  x: number;
  y: number;
}

function polygonPath(ctx: CanvasRenderingContext2D, polygon: readonly Point[]) {
  ctx.beginPath();
  polygon.forEach((p, i) => (i === 0 ? ctx.moveTo(p.x, p.y) : ctx.lineTo(p.x, p.y)));
  ctx.closePath();
}

function box(polygon: readonly Point[]) {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const p of polygon) {
    minX = Math.min(minX, p.x);
    minY = Math.min(minY, p.y);
    maxX = Math.max(maxX, p.x);
    maxY = Math.max(maxY, p.y);
  }
  return { minX, minY, maxX, maxY };
}

function arrowHead(ctx: CanvasRenderingContext2D, from: Point, to: Point, size: number) {
  const angle = Math.atan2(to.y - from.y, to.x - from.x);
  ctx.beginPath();
  ctx.moveTo(to.x, to.y);
  ctx.lineTo(to.x - size * Math.cos(angle - 0.45), to.y - size * Math.sin(angle - 0.45));
  ctx.lineTo(to.x - size * Math.cos(angle + 0.45), to.y - size * Math.sin(angle + 0.45));
  ctx.closePath();
  ctx.fill();
}

export interface SiteDrawOptions {
  zoom: number;
  markersInView: readonly string[];
  answeredCallPoints: readonly string[];
  pendingCallPointId: string | null;
}

export function drawSite(ctx: CanvasRenderingContext2D, trial: PublicTrial, o: SiteDrawOptions): void {
  const px = 1 / o.zoom;
  const { width, height } = trial.map;
  const looks = new Map(trial.surfaces.map((s) => [s.id, surfaceLook(s)]));

  // Floor: the surface the profile was made on, wherever no zone is drawn.
  ctx.fillStyle = surfaceLook({ id: 'sealed-concrete' }).fill;
  ctx.fillRect(0, 0, width, height);

  // Grid: every metre when there is room, every 5 m stronger.
  ctx.lineWidth = px;
  for (const [step, colour, minZoom] of [
    [1, INK.grid, 8],
    [5, INK.gridMajor, 0],
  ] as const) {
    if (o.zoom < minZoom) continue;
    ctx.strokeStyle = colour;
    ctx.beginPath();
    for (let x = 0; x <= width; x += step) {
      ctx.moveTo(x, 0);
      ctx.lineTo(x, height);
    }
    for (let y = 0; y <= height; y += step) {
      ctx.moveTo(0, y);
      ctx.lineTo(width, y);
    }
    ctx.stroke();
  }

  // Floor zones: tint, hatch (never colour alone), outline.
  const hatchSpacing = Math.max(0.45, 7 * px);
  for (const zone of trial.zones) {
    const look = looks.get(zone.surfaceId) ?? surfaceLook({ id: zone.surfaceId });
    polygonPath(ctx, zone.polygon);
    ctx.fillStyle = look.fill;
    ctx.fill();
    ctx.save();
    polygonPath(ctx, zone.polygon);
    ctx.clip();
    drawHatch(ctx, look.hatch, box(zone.polygon), hatchSpacing, look.ink, 1.1 * px);
    ctx.restore();
    polygonPath(ctx, zone.polygon);
    ctx.strokeStyle = look.ink;
    ctx.lineWidth = 1.5 * px;
    ctx.stroke();
  }

  // Anchor markers' viewing cones, faint; stronger for a marker the robot can read now.
  for (const marker of trial.markers) {
    const inView = o.markersInView.includes(marker.id);
    ctx.beginPath();
    ctx.moveTo(marker.x, marker.y);
    ctx.arc(marker.x, marker.y, marker.range, marker.facing - marker.fov / 2, marker.facing + marker.fov / 2);
    ctx.closePath();
    ctx.fillStyle = inView ? INK.markerConeInView : INK.markerCone;
    ctx.fill();
    ctx.setLineDash([4 * px, 4 * px]);
    ctx.strokeStyle = inView ? 'rgba(17, 86, 85, 0.55)' : 'rgba(17, 86, 85, 0.25)';
    ctx.lineWidth = px;
    ctx.stroke();
    ctx.setLineDash([]);
  }

  // The route: dashed.
  ctx.strokeStyle = INK.route;
  ctx.lineWidth = 1.5 * px;
  ctx.setLineDash([6 * px, 5 * px]);
  ctx.beginPath();
  trial.route.forEach((p, i) => (i === 0 ? ctx.moveTo(p.x, p.y) : ctx.lineTo(p.x, p.y)));
  ctx.stroke();
  ctx.setLineDash([]);

  // Call points: trigger area (hatched amber outline) and the pass path with an arrow.
  for (const callPoint of trial.callPoints) {
    const answered = o.answeredCallPoints.includes(callPoint.id);
    const due = o.pendingCallPointId === callPoint.id;
    polygonPath(ctx, callPoint.trigger);
    ctx.fillStyle = answered ? 'rgba(105, 123, 120, 0.12)' : INK.callPointFill;
    ctx.fill();
    ctx.strokeStyle = answered ? '#697b78' : INK.callPoint;
    ctx.lineWidth = (due ? 3 : 2) * px;
    ctx.setLineDash(due ? [] : [5 * px, 3 * px]);
    ctx.stroke();
    ctx.setLineDash([2 * px, 3 * px]);
    ctx.lineWidth = 2 * px;
    ctx.beginPath();
    callPoint.passPath.forEach((p, i) => (i === 0 ? ctx.moveTo(p.x, p.y) : ctx.lineTo(p.x, p.y)));
    ctx.stroke();
    ctx.setLineDash([]);
    const n = callPoint.passPath.length;
    ctx.fillStyle = ctx.strokeStyle;
    arrowHead(ctx, callPoint.passPath[n - 2], callPoint.passPath[n - 1], 9 * px);
  }

  // The dock: the footprint to stop in, the position tolerance circle and the heading.
  const { dock } = trial;
  const { length, width: robotWidth } = trial.robot.footprint;
  ctx.save();
  ctx.translate(dock.pose.x, dock.pose.y);
  ctx.beginPath();
  ctx.arc(0, 0, dock.positionTolerance, 0, 2 * Math.PI);
  ctx.fillStyle = 'rgba(22, 105, 103, 0.14)';
  ctx.fill();
  ctx.strokeStyle = INK.dock;
  ctx.lineWidth = 1.5 * px;
  ctx.stroke();
  ctx.rotate(dock.pose.theta);
  ctx.setLineDash([4 * px, 3 * px]);
  ctx.lineWidth = 2 * px;
  ctx.strokeRect(-length / 2, -robotWidth / 2, length, robotWidth);
  ctx.setLineDash([]);
  ctx.beginPath();
  ctx.moveTo(length / 2 + 0.05, 0);
  ctx.lineTo(length / 2 + 0.35, 0);
  ctx.stroke();
  ctx.fillStyle = INK.dock;
  arrowHead(ctx, { x: length / 2, y: 0 }, { x: length / 2 + 0.45, y: 0 }, 8 * px);
  ctx.restore();

  // Obstacles.
  for (const obstacle of trial.map.obstacles) {
    const look = OBSTACLE_LOOKS[obstacle.kind];
    polygonPath(ctx, obstacle.polygon);
    ctx.fillStyle = look.fill;
    ctx.fill();
    ctx.strokeStyle = look.stroke;
    ctx.lineWidth = 1.2 * px;
    ctx.stroke();
    if (obstacle.kind === 'rack' || obstacle.kind === 'barrier') {
      // Racks show their bays, barriers their stripes: a second cue besides the colour.
      ctx.save();
      polygonPath(ctx, obstacle.polygon);
      ctx.clip();
      drawHatch(ctx, obstacle.kind === 'rack' ? 'vertical' : 'diagonal', box(obstacle.polygon), obstacle.kind === 'rack' ? 2.7 : 0.35, look.stroke, px);
      ctx.restore();
    }
  }

  // Anchor markers: a diamond with a tick towards where it faces.
  const size = Math.max(0.22, 6 * px);
  for (const marker of trial.markers) {
    const inView = o.markersInView.includes(marker.id);
    ctx.save();
    ctx.translate(marker.x, marker.y);
    ctx.beginPath();
    ctx.moveTo(0, size);
    ctx.lineTo(size, 0);
    ctx.lineTo(0, -size);
    ctx.lineTo(-size, 0);
    ctx.closePath();
    ctx.fillStyle = inView ? INK.marker : '#ffffff';
    ctx.fill();
    ctx.strokeStyle = INK.marker;
    ctx.lineWidth = 2 * px;
    ctx.stroke();
    ctx.beginPath();
    ctx.moveTo(0, 0);
    ctx.lineTo(Math.cos(marker.facing) * size * 2.2, Math.sin(marker.facing) * size * 2.2);
    ctx.stroke();
    ctx.restore();
  }
}
