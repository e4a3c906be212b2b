/**
 * A joystick or gamepad through the browser's Gamepad API: polled once per animation frame
 * while the console is open. The first connected pad drives; see drive/gamepad-map.ts for the
 * mapping and the dead zone.
 */
import { computed, onBeforeUnmount, onMounted, ref, shallowRef } from 'vue';
import { readGamepad, type DriveLimits, type PadReading } from '@/drive/gamepad-map';

export interface GamepadOptions {
  limits: () => DriveLimits | null;
  /** Called once when the stop button goes down. */
  onStop: () => void;
}

const IDLE: PadReading = { command: { v: 0, w: 0 }, stop: false, active: false };

export function useGamepad(options: GamepadOptions) {
  const supported = typeof navigator !== 'undefined' && typeof navigator.getGamepads === 'function';
  const name = ref<string | null>(null);
  const standard = ref(true);
  const reading = shallowRef<PadReading>(IDLE);
  let frame = 0;
  let stopWasDown = false;

  function first(): Gamepad | null {
    if (!supported) return null;
    for (const pad of navigator.getGamepads()) if (pad && pad.connected) return pad;
    return null;
  }

  function poll() {
    frame = requestAnimationFrame(poll);
    const pad = first();
    const limits = options.limits();
    if (!pad || !limits) {
      if (name.value !== null) name.value = null;
      if (reading.value !== IDLE) reading.value = IDLE;
      stopWasDown = false;
      return;
    }
    if (name.value !== pad.id) {
      name.value = pad.id;
      standard.value = pad.mapping === 'standard';
    }
    const next = readGamepad(pad.axes, pad.buttons, limits);
    if (next.stop && !stopWasDown) options.onStop();
    stopWasDown = next.stop;
    const prev = reading.value;
    if (prev.command.v !== next.command.v || prev.command.w !== next.command.w || prev.stop !== next.stop || prev.active !== next.active) {
      reading.value = next;
    }
  }

  onMounted(() => {
    if (supported) frame = requestAnimationFrame(poll);
  });
  onBeforeUnmount(() => cancelAnimationFrame(frame));

  return {
    supported,
    name,
    standard,
    reading,
    connected: computed(() => name.value !== null),
    command: computed(() => reading.value.command),
    active: computed(() => reading.value.active),
  };
}
