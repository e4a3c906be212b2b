/**
 * Names on the map, drawn in screen pixels (so they stay readable at any zoom) with a light halo:
 * floor zones, labelled obstacles where they fit, markers, the dock, the start and call points.
 * A label that would overlap one already placed is left out; the legend names everything anyway.
 */
import type { PublicTrial } from '@shared/schemas';
import { INK, OBSTACLE_LOOKS, markerName } from './map-style';

type Project = (x: number, y: number) => { x: number; y: number };

interface Rect {
  x: number;
  y: number;
  w: number;
  h: number;
}

const overlaps = (a: Rect, b: Rect) => a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;

export function drawLabels(ctx: CanvasRenderingContext2D, trial: PublicTrial, project: Project, size: { width: number; height: number }): void {
  const placed: Rect[] = [];
  const font = (weight: number, px: number) => `${weight} ${px}px Lato, "Segoe UI", system-ui, sans-serif`;

  function label(text: string, x: number, y: number, o: { weight?: number; size?: number; colour?: string; halo?: string | null; align?: CanvasTextAlign; maxWidth?: number } = {}) {
    const px = o.size ?? 12;
    ctx.font = font(o.weight ?? 700, px);
    const w = ctx.measureText(text).width;
    if (o.maxWidth !== undefined && w > o.maxWidth) return false;
    let align = o.align ?? 'center';
    let left = align === 'center' ? x - w / 2 : align === 'left' ? x : x - w;
    // Keep a label that is partly off the canvas readable: slide it inside.
    if (left + w > 0 && left < size.width && (left < 4 || left + w > size.width - 4)) {
      left = Math.max(4, Math.min(size.width - 4 - w, left));
      align = 'left';
      x = left;
    }
    const rect = { x: left - 3, y: y - px / 2 - 2, w: w + 6, h: px + 4 };
    if (rect.x + rect.w < 0 || rect.y + rect.h < 0 || rect.x > size.width || rect.y > size.height) return false;
    if (placed.some((r) => overlaps(r, rect))) return false;
    placed.push(rect);
    ctx.textAlign = align;
    ctx.textBaseline = 'middle';
    if (o.halo !== null) {
      ctx.lineJoin = 'round';
      ctx.lineWidth = 3.5;
      ctx.strokeStyle = o.halo ?? INK.labelHalo;
      ctx.strokeText(text, x, y);
    }
    ctx.fillStyle = o.colour ?? INK.label;
    ctx.fillText(text, x, y);
    return true;
  }

  const screenBox = (polygon: readonly { x: number; y: number }[]) => {
    const pts = polygon.map((p) => project(p.x, p.y));
    const xs = pts.map((p) => p.x);
    const ys = pts.map((p) => p.y);
    return { minX: Math.min(...xs), maxX: Math.max(...xs), minY: Math.min(...ys), maxY: Math.max(...ys) };
  };

  // The robot's marks first: they matter most when space is short.
  const start = project(trial.start.x, trial.start.y);
  label('Start', start.x, start.y + 26, { size: 11 });
  const dock = project(trial.dock.pose.x, trial.dock.pose.y);
  label('Dock', dock.x, dock.y - 20, { colour: '#0f4546' });
  for (const callPoint of trial.callPoints) {
    const b = screenBox(callPoint.trigger);
    label(`Call point: ${callPoint.label}`, (b.minX + b.maxX) / 2, b.minY - 10, { size: 11, colour: '#793d0f' });
  }
  for (const marker of trial.markers) {
    const p = project(marker.x, marker.y);
    const dx = Math.cos(marker.facing);
    const align: CanvasTextAlign = dx > 0.3 ? 'left' : dx < -0.3 ? 'right' : 'center';
    const offset = align === 'center' ? 0 : dx > 0 ? 14 : -14;
    label(`${markerName(marker)} marker`, p.x + offset, p.y + (align === 'center' ? -16 * Math.sign(Math.sin(marker.facing) || 1) : 0), { size: 11, align });
  }

  // Floor zones: their label, else the surface's name.
  const surfaceNames = new Map(trial.surfaces.map((s) => [s.id, s.name]));
  for (const zone of trial.zones) {
    const b = screenBox(zone.polygon);
    const text = zone.label ?? surfaceNames.get(zone.surfaceId) ?? zone.surfaceId;
    label(text, b.minX + 6, b.minY + 11, { size: 12, align: 'left', maxWidth: b.maxX - b.minX - 10 });
  }

  // Obstacles with a label, inside them when they are big enough.
  for (const obstacle of trial.map.obstacles) {
    if (!obstacle.label) continue;
    const b = screenBox(obstacle.polygon);
    const look = OBSTACLE_LOOKS[obstacle.kind];
    const inside = b.maxY - b.minY >= 14 && b.maxX - b.minX >= 40;
    if (inside) {
      label(obstacle.label, (b.minX + b.maxX) / 2, (b.minY + b.maxY) / 2, {
        size: 11,
        colour: look.text,
        halo: null,
        maxWidth: b.maxX - b.minX - 6,
      });
    }
  }
}

/** A scale bar of a round length near `target` pixels, in the canvas's bottom-left corner. */
export function drawScaleBar(ctx: CanvasRenderingContext2D, zoom: number, height: number, target = 110): void {
  const candidates = [0.5, 1, 2, 5, 10, 20, 50];
  const metres = candidates.reduce((best, m) => (Math.abs(m * zoom - target) < Math.abs(best * zoom - target) ? m : best));
  const w = metres * zoom;
  const x = 14;
  const y = height - 16;
  ctx.fillStyle = 'rgba(255, 255, 255, 0.88)';
  ctx.fillRect(x - 6, y - 20, w + 12, 30);
  ctx.strokeStyle = '#1a2322';
  ctx.lineWidth = 2;
  ctx.beginPath();
  ctx.moveTo(x, y - 5);
  ctx.lineTo(x, y);
  ctx.lineTo(x + w, y);
  ctx.lineTo(x + w, y - 5);
  ctx.stroke();
  ctx.font = '700 11px Lato, "Segoe UI", system-ui, sans-serif';
  ctx.fillStyle = '#1a2322';
  ctx.textAlign = 'center';
  ctx.textBaseline = 'alphabetic';
  ctx.fillText(`${metres} m`, x + w / 2, y - 8);
}
