/**
 * The console's keyboard: drive keys held down become a command, Space or Esc is the emergency
 * stop, and a few keys move the map. Keys typed into a field are left alone.
 */
import { computed, onBeforeUnmount, onMounted, reactive, ref } from 'vue';
import type { DriveLimits } from '@/drive/gamepad-map';
import { DRIVE_KEYS, FINE_KEYS, STOP_KEYS, isTypingTarget, keyboardCommand, type DriveKey } from '@/drive/keyboard-map';

export type MapKey = 'zoom-in' | 'zoom-out' | 'fit' | 'follow';

export interface KeyboardDriveOptions {
  limits: () => DriveLimits | null;
  /** Drive keys and the stop key act only while this is true (the robot is being driven). */
  driving: () => boolean;
  onStop: () => void;
  onMapKey?: (key: MapKey) => void;
}

const MAP_KEYS: Record<string, MapKey> = {
  Equal: 'zoom-in',
  NumpadAdd: 'zoom-in',
  Minus: 'zoom-out',
  NumpadSubtract: 'zoom-out',
  Digit0: 'fit',
  Numpad0: 'fit',
  KeyF: 'follow',
};

export function useKeyboardDrive(options: KeyboardDriveOptions) {
  const held = reactive(new Set<DriveKey>());
  const fine = ref(false);

  const command = computed(() => {
    const limits = options.limits();
    return limits ? keyboardCommand(held, fine.value, limits) : { v: 0, w: 0 };
  });
  const active = computed(() => held.size > 0);

  function release() {
    held.clear();
    fine.value = false;
  }

  function onKeyDown(event: KeyboardEvent) {
    if (event.ctrlKey || event.metaKey || event.altKey) return;
    if (isTypingTarget(event.target)) return;
    if (FINE_KEYS.includes(event.code)) fine.value = true;
    const driving = options.driving();
    if (STOP_KEYS.includes(event.code)) {
      if (!driving) return;
      event.preventDefault();
      held.clear();
      options.onStop();
      return;
    }
    const key = DRIVE_KEYS[event.code];
    if (key) {
      if (!driving) return;
      event.preventDefault();
      // After an emergency stop a key still held down must be pressed again: ignore its auto-repeat.
      if (event.repeat && !held.has(key)) return;
      held.add(key);
      return;
    }
    const mapKey = MAP_KEYS[event.code];
    if (mapKey && options.onMapKey && !event.repeat) {
      // "+" is Shift+"=" on many layouts; both zoom in.
      event.preventDefault();
      options.onMapKey(mapKey);
    }
  }

  function onKeyUp(event: KeyboardEvent) {
    if (FINE_KEYS.includes(event.code)) fine.value = false;
    const key = DRIVE_KEYS[event.code];
    if (!key) return;
    // Another key for the same motion may still be down (↑ and W): release only when both are up.
    const others = Object.entries(DRIVE_KEYS).filter(([code, k]) => k === key && code !== event.code);
    if (others.some(([code]) => down.has(code))) return;
    held.delete(key);
  }

  // Physical keys down, to tell ↑ from W when one of them is released.
  const down = new Set<string>();
  const track = (event: KeyboardEvent) => {
    if (event.type === 'keydown') down.add(event.code);
    else down.delete(event.code);
  };

  const onBlur = () => {
    down.clear();
    release();
  };

  onMounted(() => {
    window.addEventListener('keydown', track, true);
    window.addEventListener('keyup', track, true);
    window.addEventListener('keydown', onKeyDown);
    window.addEventListener('keyup', onKeyUp);
    window.addEventListener('blur', onBlur);
  });
  onBeforeUnmount(() => {
    window.removeEventListener('keydown', track, true);
    window.removeEventListener('keyup', track, true);
    window.removeEventListener('keydown', onKeyDown);
    window.removeEventListener('keyup', onKeyUp);
    window.removeEventListener('blur', onBlur);
  });

  return { held, fine, command, active, release };
}
