/**
 * How the console draws a site: one look per floor surface (a tint AND a hatch, so colour is never
 * the only cue), per obstacle kind, and for the drive's own marks. Text on the map is dark on light
 * or white on dark, at WCAG AA contrast.
 */
import type { AnchorMarker, Obstacle, Surface } from '@shared/schemas';

export type Hatch = 'none' | 'dots' | 'diagonal' | 'cross' | 'horizontal' | 'vertical' | 'back-diagonal';

export interface SurfaceLook {
  fill: string;
  ink: string;
  hatch: Hatch;
}

const KNOWN_SURFACES: Record<string, SurfaceLook> = {
  'sealed-concrete': { fill: '#f4f7f6', ink: '#b8c5c3', hatch: 'none' },
  'epoxy-coat': { fill: '#e2ecf6', ink: '#4b6f92', hatch: 'dots' },
  'wet-wash-bay': { fill: '#d3ebf4', ink: '#236f91', hatch: 'diagonal' },
  'steel-dock-plate': { fill: '#e3e3ea', ink: '#55556a', hatch: 'cross' },
  'rubber-mat': { fill: '#efe5da', ink: '#7a5634', hatch: 'horizontal' },
};

const SPARE_LOOKS: SurfaceLook[] = [
  { fill: '#e8f1e4', ink: '#4d7340', hatch: 'vertical' },
  { fill: '#f3e6ef', ink: '#83406f', hatch: 'back-diagonal' },
  { fill: '#f6efd9', ink: '#7d6418', hatch: 'dots' },
];

/** The look of a surface: its own when known, else one of the spare looks (stable per id). */
export function surfaceLook(surface: Pick<Surface, 'id'>): SurfaceLook {
  const known = KNOWN_SURFACES[surface.id];
  if (known) return known;
  let hash = 0;
  for (const ch of surface.id) hash = (hash * 31 + ch.charCodeAt(0)) >>> 0;
  return SPARE_LOOKS[hash % SPARE_LOOKS.length];
}

export interface ObstacleLook {
  fill: string;
  stroke: string;
  /** Text drawn on top of the obstacle. */
  text: string;
  name: string;
}

export const OBSTACLE_LOOKS: Record<Obstacle['kind'], ObstacleLook> = {
  wall: { fill: '#2a3533', stroke: '#0d1413', text: '#ffffff', name: 'Wall' },
  rack: { fill: '#9fb0ad', stroke: '#3e4c4a', text: '#0d1413', name: 'Rack' },
  charger: { fill: '#166967', stroke: '#062325', text: '#ffffff', name: 'Charger' },
  pillar: { fill: '#3e4c4a', stroke: '#0d1413', text: '#ffffff', name: 'Column' },
  barrier: { fill: '#954c0a', stroke: '#3a1904', text: '#ffffff', name: 'Barrier' },
  equipment: { fill: '#a77c52', stroke: '#4a2f16', text: '#0d1413', name: 'Parked equipment' },
};

/** Colours of the drive's own marks on the map. */
export const INK = {
  grid: 'rgba(62, 76, 74, 0.10)',
  gridMajor: 'rgba(62, 76, 74, 0.22)',
  route: '#51615e',
  trail: '#115655',
  robotFill: 'rgba(255, 255, 255, 0.7)',
  robotStroke: '#0d393b',
  robotNose: '#0d393b',
  cloud: 'rgba(122, 36, 104, 0.5)',
  ring: '#6b1f5f',
  pin: '#1d4ed8',
  pinFill: 'rgba(29, 78, 216, 0.10)',
  marker: '#0d393b',
  markerCone: 'rgba(17, 86, 85, 0.03)',
  markerConeInView: 'rgba(17, 86, 85, 0.10)',
  dock: '#166967',
  callPoint: '#954c0a',
  callPointFill: 'rgba(242, 161, 38, 0.18)',
  label: '#1a2322',
  labelHalo: 'rgba(255, 255, 255, 0.85)',
} as const;

/** "marker-east-1" → "East 1": markers have ids only; this is how the console names them. */
export function markerName(marker: Pick<AnchorMarker, 'id'> | string): string {
  const id = typeof marker === 'string' ? marker : marker.id;
  const words = id.replace(/^marker-/, '').split('-').filter(Boolean);
  const text = words.join(' ');
  return text ? text.charAt(0).toUpperCase() + text.slice(1) : id;
}

/** What a person calls the obstacle: its label, else its kind. */
export function obstacleName(obstacle: Pick<Obstacle, 'kind' | 'label'>): string {
  return obstacle.label ?? OBSTACLE_LOOKS[obstacle.kind].name;
}

/**
 * Draws a hatch inside the current clip, in world units (metres): the caller clips to the zone.
 * `spacing` in metres.
 */
export function drawHatch(
  ctx: CanvasRenderingContext2D,
  hatch: Hatch,
  box: { minX: number; minY: number; maxX: number; maxY: number },
  spacing: number,
  ink: string,
  lineWidth: number,
): void {
  if (hatch === 'none') return;
  ctx.strokeStyle = ink;
  ctx.fillStyle = ink;
  ctx.lineWidth = lineWidth;
  const { minX, minY, maxX, maxY } = box;
  ctx.beginPath();
  if (hatch === 'dots') {
    const r = spacing * 0.12;
    for (let x = Math.floor(minX / spacing) * spacing; x <= maxX; x += spacing) {
      for (let y = Math.floor(minY / spacing) * spacing; y <= maxY; y += spacing) {
        ctx.moveTo(x + r, y);
        ctx.arc(x, y, r, 0, 2 * Math.PI);
      }
    }
    ctx.fill();
    return;
  }
  const span = maxX - minX + (maxY - minY);
  const lines = (dx: number, dy: number) => {
    // Lines through points spaced along the perpendicular, long enough to cross the box.
    const nx = -dy;
    const ny = dx;
    const cx = (minX + maxX) / 2;
    const cy = (minY + maxY) / 2;
    for (let k = -span; k <= span; k += spacing) {
      const px = cx + nx * k;
      const py = cy + ny * k;
      ctx.moveTo(px - dx * span, py - dy * span);
      ctx.lineTo(px + dx * span, py + dy * span);
    }
  };
  const d = Math.SQRT1_2;
  if (hatch === 'horizontal') lines(1, 0);
  if (hatch === 'vertical') lines(0, 1);
  if (hatch === 'diagonal' || hatch === 'cross') lines(d, d);
  if (hatch === 'back-diagonal' || hatch === 'cross') lines(d, -d);
  ctx.stroke();
}
