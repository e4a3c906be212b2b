/**
 * Pan and zoom of the console's map: the view (centre and pixels per metre), the canvas size,
 * and whether the view follows the robot.
 */
import { computed, ref, shallowRef } from 'vue';
import { ZOOM_STEP, clampZoom, fitView, panBy, toScreen, toWorld, worldTransform, zoomAt, type Size, type ViewState } from '@/drive/map-view';

/** Pixels per metre of the first view. */
const START_ZOOM = 36;

export function useMapView(site: () => { width: number; height: number } | null) {
  const size = shallowRef<Size>({ width: 800, height: 500 });
  const view = shallowRef<ViewState>({ cx: 0, cy: 0, zoom: 10 });
  const follow = ref(true);
  const fitted = ref(false);

  const transform = computed(() => worldTransform(view.value, size.value));

  function fit() {
    const s = site();
    if (!s) return;
    view.value = fitView(s.width, s.height, size.value);
    follow.value = false;
    fitted.value = true;
  }

  function zoom(factor: number, sx?: number, sy?: number) {
    // While following, zoom about the robot (the middle of the canvas).
    const anchorX = follow.value ? undefined : sx;
    const anchorY = follow.value ? undefined : sy;
    view.value = zoomAt(view.value, size.value, factor, anchorX, anchorY);
  }

  const zoomIn = () => zoom(ZOOM_STEP);
  const zoomOut = () => zoom(1 / ZOOM_STEP);

  function pan(dx: number, dy: number) {
    follow.value = false;
    view.value = panBy(view.value, dx, dy);
  }

  /** Keeps the robot in the middle while following. */
  function centreOn(x: number, y: number) {
    if (!follow.value) return;
    if (view.value.cx === x && view.value.cy === y) return;
    view.value = { ...view.value, cx: x, cy: y };
  }

  function resize(next: Size) {
    if (next.width <= 0 || next.height <= 0) return;
    if (next.width === size.value.width && next.height === size.value.height) return;
    size.value = next;
    if (!fitted.value) {
      const s = site();
      if (s) {
        // First layout: close enough to see the robot and the cloud, far enough to see the way ahead.
        const whole = fitView(s.width, s.height, next);
        view.value = { ...whole, zoom: clampZoom(Math.max(whole.zoom * 1.6, START_ZOOM)) };
        fitted.value = true;
      }
    }
  }

  return {
    size,
    view,
    follow,
    transform,
    fit,
    zoom,
    zoomIn,
    zoomOut,
    pan,
    centreOn,
    resize,
    toScreen: (x: number, y: number) => toScreen(view.value, size.value, x, y),
    toWorld: (sx: number, sy: number) => toWorld(view.value, size.value, sx, sy),
  };
}

export type MapView = ReturnType<typeof useMapView>;
