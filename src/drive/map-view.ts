/**
 * The map's view: which point of the site is in the middle of the canvas and how many pixels a
 * metre takes. World y points north (up); the canvas y points down, so the world layers are drawn
 * with scaleY = −zoom. Pure; useMapView wraps it in Vue state.
 */
export interface ViewState {
  /** World point at the centre of the canvas, m. */
  cx: number;
  cy: number;
  /** Pixels per metre. */
  zoom: number;
}

export interface Size {
  width: number;
  height: number;
}

export const MIN_ZOOM = 2;
export const MAX_ZOOM = 400;
export const ZOOM_STEP = 1.25;

export const clampZoom = (zoom: number) => Math.min(MAX_ZOOM, Math.max(MIN_ZOOM, zoom));

/** The Konva transform of the world layers. */
export function worldTransform(view: ViewState, size: Size) {
  return {
    x: size.width / 2 - view.cx * view.zoom,
    y: size.height / 2 + view.cy * view.zoom,
    scaleX: view.zoom,
    scaleY: -view.zoom,
  };
}

export function toScreen(view: ViewState, size: Size, x: number, y: number): { x: number; y: number } {
  return { x: size.width / 2 + (x - view.cx) * view.zoom, y: size.height / 2 - (y - view.cy) * view.zoom };
}

export function toWorld(view: ViewState, size: Size, sx: number, sy: number): { x: number; y: number } {
  return { x: view.cx + (sx - size.width / 2) / view.zoom, y: view.cy - (sy - size.height / 2) / view.zoom };
}

/** The view that shows the whole w × h site with a margin. */
export function fitView(siteWidth: number, siteHeight: number, size: Size, margin = 16): ViewState {
  const zoom = clampZoom(Math.min((size.width - 2 * margin) / siteWidth, (size.height - 2 * margin) / siteHeight));
  return { cx: siteWidth / 2, cy: siteHeight / 2, zoom: Number.isFinite(zoom) && zoom > 0 ? zoom : MIN_ZOOM };
}

/** Zooms by `factor`, keeping the world point under the screen point (sx, sy) where it is. */
export function zoomAt(view: ViewState, size: Size, factor: number, sx = size.width / 2, sy = size.height / 2): ViewState {
  const zoom = clampZoom(view.zoom * factor);
  const anchor = toWorld(view, size, sx, sy);
  return {
    zoom,
    cx: anchor.x - (sx - size.width / 2) / zoom,
    cy: anchor.y + (sy - size.height / 2) / zoom,
  };
}

/** Moves the view by a drag of (dx, dy) pixels. */
export function panBy(view: ViewState, dx: number, dy: number): ViewState {
  return { ...view, cx: view.cx - dx / view.zoom, cy: view.cy + dy / view.zoom };
}
