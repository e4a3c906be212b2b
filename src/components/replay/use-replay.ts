/**
 * The replay's state in Vue: the track, the belief cursor and the play clock, moved on by
 * animation frames. The drift cloud catches up with the shown position by at most a few hundred
 * steps a frame, so a long backward seek never freezes the page; until it has caught up the
 * cloud is hidden rather than shown at the wrong moment.
 */
import { computed, onBeforeUnmount, ref, shallowRef, watch, type Ref } from 'vue';
import type { AttemptReport } from '@shared/schemas';
import { callPosition, contactEpisodes } from '@/components/report/report-logic';
import { BeliefCursor, ReplayTrack, beliefFactory, play as playClock, replayPaths, seekClock, tickClock, type ClockState, type ReplaySpeed } from './replay';

/** Steps of the drift cloud a frame may take (about 80 µs each). */
const STEPS_PER_FRAME = 250;

export interface TimelineMark {
  kind: 'call' | 'contact';
  position: number;
  label: string;
  key: string;
}

export function useReplay(report: Ref<AttemptReport | null>) {
  const track = shallowRef<ReplayTrack | null>(null);
  const paths = shallowRef<ReturnType<typeof replayPaths> | null>(null);
  let cursor: BeliefCursor | null = null;
  const clock = ref<ClockState>({ playing: false, speed: 4, position: 0 });
  /** The position shown (whole steps). */
  const position = ref(0);
  const cloudReady = ref(false);
  /** Bumped whenever the cloud changes, to redraw it. */
  const revision = ref(0);
  let frame: number | null = null;
  let lastTime: number | null = null;

  // A new attempt starts a new replay; the same attempt loaded again (after a claim or a
  // verdict) keeps the replay where it is.
  watch(
    () => (report.value ? `${report.value.attempt.id}:${report.value.trace.length}` : null),
    () => {
      const r = report.value;
      stop();
      if (!r) {
        track.value = null;
        paths.value = null;
        cursor = null;
        return;
      }
      const make = beliefFactory(r.trial, r.publicSeed);
      track.value = new ReplayTrack(r.trace, r.trial.start, make);
      paths.value = replayPaths(r.trace, r.trial.start);
      cursor = new BeliefCursor(r.trace, () => make());
      clock.value = { playing: false, speed: clock.value.speed, position: 0 };
      position.value = 0;
      cloudReady.value = true;
      revision.value += 1;
    },
    { immediate: true },
  );

  const last = computed(() => track.value?.last ?? 0);
  const period = computed(() => report.value?.trial.robot.controlPeriod ?? 0.1);

  const marks = computed<TimelineMark[]>(() => {
    const r = report.value;
    if (!r) return [];
    const calls = (r.finalScore ?? r.score).calls.map((c, i) => ({
      kind: 'call' as const,
      position: callPosition(r.trace, c.time),
      label: `Call ${i + 1}: ${c.label}`,
      key: `call-${c.callPointId}`,
    }));
    const contacts = contactEpisodes(r.trace).map((c, i) => ({ kind: 'contact' as const, position: c.position, label: `Contact ${i + 1}`, key: `contact-${i}` }));
    return [...calls, ...contacts].sort((a, b) => a.position - b.position);
  });

  function schedule() {
    if (frame === null) frame = requestAnimationFrame(onFrame);
  }

  function onFrame(now: number) {
    frame = null;
    const elapsed = lastTime === null ? 0 : now - lastTime;
    lastTime = now;
    if (clock.value.playing) clock.value = tickClock(clock.value, Math.min(elapsed, 250), period.value, last.value);
    position.value = Math.floor(clock.value.position);
    let busy = clock.value.playing;
    if (cursor) {
      const there = cursor.advanceToward(position.value, STEPS_PER_FRAME);
      if (there) {
        if (!cloudReady.value || cursor.position !== shownCloud) revision.value += 1;
        shownCloud = cursor.position;
        cloudReady.value = true;
      } else {
        cloudReady.value = false;
        busy = true;
      }
    }
    if (busy) schedule();
    else lastTime = null;
  }
  let shownCloud = 0;

  function play() {
    clock.value = playClock(clock.value, last.value);
    lastTime = null;
    schedule();
  }

  function pause() {
    clock.value = { ...clock.value, playing: false };
  }

  function stop() {
    if (frame !== null) cancelAnimationFrame(frame);
    frame = null;
    lastTime = null;
  }

  function seek(to: number) {
    clock.value = seekClock(clock.value, to, last.value);
    position.value = Math.floor(clock.value.position);
    schedule();
  }

  function setSpeed(speed: ReplaySpeed) {
    clock.value = { ...clock.value, speed };
  }

  onBeforeUnmount(stop);

  return {
    track,
    paths,
    clock,
    position,
    last,
    cloudReady,
    revision,
    marks,
    cloud: () => (cloudReady.value && cursor ? cursor.current.cloud : null),
    play,
    pause,
    seek,
    setSpeed,
  };
}

export type Replay = ReturnType<typeof useReplay>;
