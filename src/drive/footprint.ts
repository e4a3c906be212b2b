/**
 * Drawing a robot's footprint in its own frame (x forward): a rectangle with a chevron at the
 * front, optionally a dot at the pose itself. Line widths are in screen pixels (divided by zoom).
 */
export interface FootprintStyle {
  fill: string;
  stroke: string;
  strokePx: number;
  nose: string;
  /** Colour of a dot at the pose itself, or none. */
  centreDot?: string;
}

export function drawFootprint(ctx: CanvasRenderingContext2D, length: number, width: number, zoom: number, style: FootprintStyle): void {
  const hl = length / 2;
  const hw = width / 2;
  ctx.beginPath();
  ctx.rect(-hl, -hw, length, width);
  ctx.fillStyle = style.fill;
  ctx.fill();
  ctx.lineWidth = style.strokePx / zoom;
  ctx.strokeStyle = style.stroke;
  ctx.stroke();
  // Front chevron.
  const back = hl - Math.min(length * 0.45, 0.45);
  ctx.beginPath();
  ctx.moveTo(back, hw * 0.7);
  ctx.lineTo(hl - 0.06, 0);
  ctx.lineTo(back, -hw * 0.7);
  ctx.lineWidth = 2.5 / zoom;
  ctx.strokeStyle = style.nose;
  ctx.stroke();
  if (style.centreDot) {
    ctx.beginPath();
    ctx.arc(0, 0, 2.5 / zoom, 0, 2 * Math.PI);
    ctx.fillStyle = style.centreDot;
    ctx.fill();
  }
}
