/**
 * The operator's three ways to drive — keyboard, on-screen pad, gamepad — merged into one
 * command for the drive session. A moved gamepad stick wins, then the keyboard, then the pad.
 * After an emergency stop every input must be let go before the robot takes a command again.
 */
import { computed, reactive, ref, watch } from 'vue';
import type { Command } from '@shared/sim';
import type { DriveLimits } from '@/drive/gamepad-map';
import { keyboardCommand, type DriveKey } from '@/drive/keyboard-map';
import { useGamepad } from './useGamepad';
import { useKeyboardDrive, type MapKey } from './useKeyboardDrive';

export interface DriveControlsOptions {
  limits: () => DriveLimits | null;
  /** The robot takes drive input now. */
  driving: () => boolean;
  setCommand: (command: Command) => void;
  emergencyStop: () => void;
  onMapKey?: (key: MapKey) => void;
}

export function useDriveControls(options: DriveControlsOptions) {
  /** Set by the emergency stop; cleared once every input is released. */
  const latched = ref(false);

  function stop() {
    pad.clear();
    // Keys and pad buttons need a fresh press anyway; a stick still pushed must be let go first.
    latched.value = gamepad.active.value;
    options.setCommand({ v: 0, w: 0 });
    options.emergencyStop();
  }

  const keyboard = useKeyboardDrive({ limits: options.limits, driving: options.driving, onStop: stop, onMapKey: options.onMapKey });
  const gamepad = useGamepad({ limits: options.limits, onStop: () => options.driving() && stop() });

  /** On-screen pad buttons held down (pointer or Enter). */
  const pad = reactive(new Set<DriveKey>());
  const padFine = ref(false);
  const padCommand = computed(() => {
    const limits = options.limits();
    return limits ? keyboardCommand(pad, padFine.value, limits) : { v: 0, w: 0 };
  });

  const anyInput = computed(() => gamepad.active.value || keyboard.active.value || pad.size > 0);
  const source = computed<'gamepad' | 'keyboard' | 'pad' | null>(() => {
    if (gamepad.active.value && (gamepad.command.value.v !== 0 || gamepad.command.value.w !== 0)) return 'gamepad';
    if (keyboard.active.value) return 'keyboard';
    if (pad.size > 0) return 'pad';
    return null;
  });
  const command = computed<Command>(() => {
    if (latched.value || !options.driving()) return { v: 0, w: 0 };
    if (source.value === 'gamepad') return gamepad.command.value;
    if (source.value === 'keyboard') return keyboard.command.value;
    if (source.value === 'pad') return padCommand.value;
    return { v: 0, w: 0 };
  });

  watch(anyInput, (any) => {
    if (!any) latched.value = false;
  });
  watch(command, (c) => options.setCommand(c), { deep: true });
  watch(
    () => options.driving(),
    (driving) => {
      if (!driving) pad.clear();
    },
  );

  function pressPad(key: DriveKey) {
    if (!options.driving()) return;
    pad.add(key);
  }
  function releasePad(key: DriveKey) {
    pad.delete(key);
  }

  return { keyboard, gamepad, pad, padFine, pressPad, releasePad, stop, latched, source, command };
}
