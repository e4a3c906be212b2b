/**
 * Pan and zoom of a report map: starts on the part of the site the drive used (or the whole
 * site) and keeps it in view when the map is resized, until the person zooms or pans. Built on
 * the console's pure view maths (src/drive/map-view).
 */
import { computed, ref, shallowRef } from 'vue';
import { MIN_ZOOM, ZOOM_STEP, clampZoom, fitView, panBy, toScreen, worldTransform, zoomAt, type Size, type ViewState } from '@/drive/map-view';

export interface Box {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/** The view that shows a box of the world with a margin of pixels. */
export function fitBoxView(box: Box, size: Size, margin = 28): ViewState {
  const w = Math.max(box.maxX - box.minX, 1);
  const h = Math.max(box.maxY - box.minY, 1);
  const zoom = clampZoom(Math.min((size.width - 2 * margin) / w, (size.height - 2 * margin) / h));
  return { cx: (box.minX + box.maxX) / 2, cy: (box.minY + box.maxY) / 2, zoom: Number.isFinite(zoom) && zoom > 0 ? zoom : MIN_ZOOM };
}

export function useFitView(site: () => { width: number; height: number }, area: () => Box | null = () => null) {
  const size = shallowRef<Size>({ width: 800, height: 500 });
  const view = shallowRef<ViewState>(fitView(site().width, site().height, size.value));
  /** What the view keeps in sight on resizes: the drive's area, the whole site, or nothing once moved by hand. */
  const fitted = ref<'area' | 'site' | null>('area');
  const transform = computed(() => worldTransform(view.value, size.value));

  function fitSite() {
    const s = site();
    view.value = fitView(s.width, s.height, size.value);
    fitted.value = 'site';
  }

  /** The drive's area when there is one, else the whole site. */
  function fit() {
    const box = area();
    if (!box) return fitSite();
    view.value = fitBoxView(box, size.value);
    fitted.value = 'area';
  }

  function resize(next: Size) {
    if (next.width <= 0 || next.height <= 0) return;
    if (next.width === size.value.width && next.height === size.value.height) return;
    size.value = next;
    if (fitted.value === 'site') fitSite();
    else if (fitted.value === 'area') fit();
  }

  function zoom(factor: number, sx?: number, sy?: number) {
    view.value = zoomAt(view.value, size.value, factor, sx, sy);
    fitted.value = null;
  }

  function pan(dx: number, dy: number) {
    view.value = panBy(view.value, dx, dy);
    fitted.value = null;
  }

  /** Centres on a point at a zoom of at least `minZoom` (a call, a contact). */
  function focus(x: number, y: number, minZoom: number) {
    view.value = { cx: x, cy: y, zoom: clampZoom(Math.max(view.value.zoom, minZoom)) };
    fitted.value = null;
  }

  /** Keeps the zoom and puts a point in the middle (following the robot). */
  function centre(x: number, y: number) {
    view.value = { ...view.value, cx: x, cy: y };
    fitted.value = null;
  }

  return {
    size,
    view,
    fitted,
    transform,
    fit,
    fitSite,
    resize,
    zoom,
    zoomIn: () => zoom(ZOOM_STEP),
    zoomOut: () => zoom(1 / ZOOM_STEP),
    pan,
    focus,
    centre,
    project: (x: number, y: number) => toScreen(view.value, size.value, x, y),
  };
}

export type FitView = ReturnType<typeof useFitView>;
