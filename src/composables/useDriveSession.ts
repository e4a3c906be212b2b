/**
 * One drive in the console: loads the attempt and its trial, rebuilds the drift cloud from the
 * odometry trail, takes a command every control period while the operator drives, sends them in
 * numbered batches (resent unchanged until acknowledged), plays the answers out on screen, and
 * makes the calls, the submission or the abandonment.
 *
 * The belief is fed with every odometry pose the server returns, steps and passes alike, in order
 * (DESIGN.md, "How a drive works" 4), so the cloud drawn here is the one the server scores against.
 */
import { computed, onBeforeUnmount, onMounted, reactive, ref, shallowRef, watch } from 'vue';
import type { Pose } from '@shared/motion';
import type { AttemptSummary, AttemptView, Call, PublicTrial } from '@shared/schemas';
import { Belief, World, type BatchResult, type BeliefSnapshot, type Command, type DriveState, type EstimatePin } from '@shared/sim';
import { attemptsApi, errorMessage, isApiError } from '@/api';
import { CommandBatcher, isTransient, type LinkState, type ResyncReason } from '@/drive/batcher';
import { ControlClock } from '@/drive/control-clock';
import { markerName, obstacleName } from '@/drive/map-style';
import { DrivePlayback } from '@/drive/playback';

export type ConsolePhase = 'loading' | 'ready' | 'finished' | 'failed';

export interface ContactNotice {
  obstacleId: string;
  name: string;
  /** Drive time of the contact, s. */
  time: number;
}

export type PauseReason = 'not-started' | 'connection' | 'call' | 'pass' | 'contact' | 'hidden' | 'finishing' | 'over' | null;

const ZERO: Command = { v: 0, w: 0 };
/** Milliseconds between two batches: two control periods of commands per request at most speeds. */
const SEND_INTERVAL = 200;
const RESYNC_MESSAGES: Record<ResyncReason, string> = {
  seq_conflict: 'The server had other commands for this drive than this console (another tab?). The console reloaded the drive from the server.',
  awaiting_call: 'A call is due. The console reloaded the drive from the server.',
  time_up: 'The time limit is reached. The console reloaded the drive from the server.',
  not_driving: 'This drive is over. The console reloaded it from the server.',
};

const retryDelay = (n: number) => Math.min(4000, 250 * 2 ** Math.min(n - 1, 4));
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

export function useDriveSession(attemptId: string) {
  const phase = ref<ConsolePhase>('loading');
  const failure = ref<string | null>(null);
  const notice = ref<string | null>(null);
  const trial = shallowRef<PublicTrial | null>(null);
  const attempt = shallowRef<AttemptSummary | null>(null);
  /** The drive state as of the pose on screen. */
  const shown = shallowRef<DriveState | null>(null);
  /** The latest state the server acknowledged (may be ahead of the screen). */
  const acked = shallowRef<DriveState | null>(null);
  const pose = shallowRef<Pose>({ x: 0, y: 0, theta: 0 });
  const snapshot = shallowRef<BeliefSnapshot | null>(null);
  /** Bumped whenever the cloud, trail or robot moved: the map redraws. */
  const revision = ref(0);
  const link = ref<LinkState>('ok');
  const linkFailures = ref(0);
  const reconnected = ref(false);
  const armed = ref(false);
  const hidden = ref(false);
  const finishing = ref(false);
  const passing = ref(false);
  const estop = ref(false);
  const contact = ref<ContactNotice | null>(null);
  const dockReached = ref(false);
  const calling = ref(false);
  const callError = ref<string | null>(null);
  const finished = shallowRef<AttemptView | null>(null);
  const counters = reactive({ queued: 0, acknowledged: 0, dropped: 0, sends: 0, resends: 0 });
  const current = shallowRef<Command>(ZERO);
  /** The seq the drive was at when this console loaded it (the counters count from there). */
  const startSeq = ref(0);

  let world: World | null = null;
  let belief: Belief | null = null;
  let playback: DrivePlayback | null = null;
  let batcher: CommandBatcher | null = null;
  let clock: ControlClock | null = null;
  let raf = 0;
  let reconnectTimer: ReturnType<typeof setTimeout> | undefined;
  let disposed = false;

  const marker = (id: string) => trial.value?.markers.find((m) => m.id === id);
  const markerNoise = (id: string | null) => (id ? (marker(id)?.noise ?? { position: 0, heading: 0 }) : { position: 0, heading: 0 });

  const status = computed(() => shown.value?.status ?? null);
  const callPoint = computed(() => {
    const state = shown.value;
    if (!state || state.status !== 'awaiting_call' || passing.value) return null;
    return trial.value?.callPoints.find((c) => c.id === state.pendingCallPointId) ?? null;
  });

  const pauseReason = computed<PauseReason>(() => {
    const state = acked.value;
    if (phase.value !== 'ready' || !state) return 'over';
    if (finishing.value) return 'finishing';
    if (state.status === 'time_up' || state.status === 'submitted' || state.status === 'abandoned') return 'over';
    if (link.value !== 'ok') return 'connection';
    if (passing.value) return 'pass';
    if (state.status === 'awaiting_call' || shown.value?.status === 'awaiting_call') return 'call';
    if (contact.value) return 'contact';
    if (hidden.value) return 'hidden';
    if (!armed.value) return 'not-started';
    return null;
  });

  /** The robot can take drive input now (perhaps waiting for the first command). */
  const canDrive = computed(() => pauseReason.value === null || pauseReason.value === 'not-started');

  watch(pauseReason, (reason) => {
    if (!clock) return;
    if (reason === null) clock.start();
    else clock.stop();
  });

  function syncCounters() {
    if (batcher) Object.assign(counters, batcher.stats);
  }

  function redraw() {
    if (!playback || !belief) return;
    pose.value = playback.pose;
    snapshot.value = belief.snapshot();
    revision.value += 1;
  }

  function loop(now: number) {
    raf = requestAnimationFrame(loop);
    if (playback?.frame(now)) redraw();
  }

  function onShown(result: BatchResult) {
    shown.value = result.state;
    for (const event of result.events) {
      if (event.type === 'contact') {
        const obstacle = trial.value?.map.obstacles.find((o) => o.id === event.obstacleId);
        contact.value = {
          obstacleId: event.obstacleId,
          name: obstacle ? obstacleName(obstacle) : 'the edge of the map',
          time: result.state.time,
        };
        current.value = ZERO;
      } else if (event.type === 'dock_reached') {
        dockReached.value = true;
      } else if (event.type === 'pass_done') {
        passing.value = false;
      }
    }
    if (!result.state.docked) dockReached.value = false;
  }

  function teardown() {
    clock?.stop();
    batcher?.stop();
    clock = null;
    batcher = null;
  }

  async function load(): Promise<void> {
    teardown();
    phase.value = 'loading';
    failure.value = null;
    try {
      const view = await attemptsApi.get(attemptId);
      // The trial as this attempt drives it: on a fleet profile, its robot and alphas.
      const t = view.trial;
      if (disposed) return;
      attempt.value = view.attempt;
      trial.value = t;
      shown.value = view.state;
      acked.value = view.state;
      if (view.state.status === 'submitted' || view.state.status === 'abandoned') {
        finished.value = view;
        phase.value = 'finished';
        return;
      }
      start(t, view);
      phase.value = 'ready';
    } catch (error) {
      if (disposed) return;
      failure.value = errorMessage(error);
      phase.value = 'failed';
    }
  }

  function start(t: PublicTrial, view: AttemptView) {
    world = new World(t, t.robot, t.surfaces);
    const w = world;
    belief = new Belief(t.start, view.publicSeed, t.robot.assumedProfile.alphas, (x, y) => w.driftMultiplierAt(x, y));
    playback = new DrivePlayback(t.start, { belief, markerNoise, period: t.robot.controlPeriod, onShown });
    // Resuming (a reload, another tab): the same belief, rebuilt from the trail and its restarts.
    playback.replayTrail(view.odometryTrail, view.reanchors ?? []);
    passing.value = false;
    contact.value = null;
    dockReached.value = view.state.docked;
    redraw();

    startSeq.value = view.state.seq;
    batcher = new CommandBatcher(view.state.seq, {
      send: (batch) => attemptsApi.steps(attemptId, batch.fromSeq, batch.commands),
      sendInterval: SEND_INTERVAL,
      onResult: (result) => {
        acked.value = result.state;
        playback?.enqueue(result);
        syncCounters();
      },
      onLinkChange: (state) => setLink(state),
      onResync: (reason) => void resync(reason),
      onFatal: (error) => {
        failure.value = errorMessage(error);
        phase.value = 'failed';
        syncCounters();
      },
    });
    if (view.state.status !== 'driving') batcher.hold(true);
    clock = new ControlClock({ period: t.robot.controlPeriod, sample });
    syncCounters();
  }

  function setLink(state: LinkState) {
    const was = link.value;
    link.value = state;
    linkFailures.value = state === 'ok' ? 0 : linkFailures.value + 1;
    if (state === 'ok' && was !== 'ok') {
      reconnected.value = true;
      clearTimeout(reconnectTimer);
      reconnectTimer = setTimeout(() => (reconnected.value = false), 5000);
    }
    if (state !== 'ok') reconnected.value = false;
    syncCounters();
  }

  async function resync(reason: ResyncReason) {
    notice.value = RESYNC_MESSAGES[reason];
    await load();
  }

  /** One control period: the command of the moment goes into the next batch. */
  function sample() {
    batcher?.push(current.value);
    syncCounters();
  }

  /** The operator's controls changed what they ask for. */
  function setCommand(command: Command) {
    current.value = command.v === 0 && command.w === 0 ? ZERO : command;
    if (command.v !== 0 || command.w !== 0) {
      estop.value = false;
      if (pauseReason.value === 'not-started') armed.value = true;
    }
  }

  /** Zeroes the command at once and sends a stop straight away. */
  function emergencyStop() {
    current.value = ZERO;
    estop.value = true;
    if (!batcher || !acked.value || acked.value.status !== 'driving') return;
    if (!armed.value) return;
    batcher.emergencyStop();
    syncCounters();
  }

  function acknowledgeContact() {
    contact.value = null;
  }

  async function retrying<T>(send: () => Promise<T>): Promise<T> {
    for (let n = 1; ; n++) {
      try {
        const result = await send();
        if (link.value !== 'ok') setLink('ok');
        return result;
      } catch (error) {
        if (!isTransient(error) || disposed) throw error;
        if (link.value !== 'lost') setLink('lost');
        await sleep(retryDelay(n));
      }
    }
  }

  /** Makes the call due at the call point on screen. */
  async function makeCall(call: Call, estimate: EstimatePin | null): Promise<boolean> {
    const point = callPoint.value;
    if (!point || calling.value) return false;
    calling.value = true;
    callError.value = null;
    try {
      const answer = { callPointId: point.id, call, ...(estimate ? { estimate } : {}) };
      const result = await retrying(() => attemptsApi.call(attemptId, answer));
      acked.value = result.state;
      batcher?.reset(result.seq);
      passing.value = true;
      playback?.enqueue(result);
      if (result.state.status === 'driving') batcher?.hold(false);
      return true;
    } catch (error) {
      if (isApiError(error) && (error.code === 'call_already_made' || error.code === 'not_awaiting_call')) {
        notice.value = 'That call point was already answered. The console reloaded the drive from the server.';
        await load();
      } else {
        callError.value = errorMessage(error);
      }
      return false;
    } finally {
      calling.value = false;
    }
  }

  /** Waits until every queued command has been acknowledged. */
  async function settle(): Promise<void> {
    while (batcher && (batcher.pending > 0 || batcher.busy) && !disposed && phase.value === 'ready') await sleep(50);
  }

  async function finish(how: 'submit' | 'abandon'): Promise<boolean> {
    if (finishing.value) return false;
    finishing.value = true;
    current.value = ZERO;
    try {
      await settle();
      const view = await retrying(() => (how === 'submit' ? attemptsApi.submit(attemptId) : attemptsApi.abandon(attemptId)));
      playback?.drain();
      teardown();
      finished.value = view;
      shown.value = view.state;
      acked.value = view.state;
      phase.value = 'finished';
      return true;
    } catch (error) {
      notice.value = errorMessage(error);
      return false;
    } finally {
      finishing.value = false;
    }
  }

  function onVisibility() {
    hidden.value = document.visibilityState === 'hidden';
    if (hidden.value) {
      // Keys released while the tab was hidden never reach it: stop, and wait for a new command.
      current.value = ZERO;
      armed.value = false;
    }
  }

  function onOnline() {
    batcher?.retryNow();
  }

  onMounted(() => {
    document.addEventListener('visibilitychange', onVisibility);
    window.addEventListener('online', onOnline);
    raf = requestAnimationFrame(loop);
    void load();
  });

  onBeforeUnmount(() => {
    disposed = true;
    cancelAnimationFrame(raf);
    clearTimeout(reconnectTimer);
    document.removeEventListener('visibilitychange', onVisibility);
    window.removeEventListener('online', onOnline);
    teardown();
  });

  return {
    phase,
    failure,
    notice,
    trial,
    attempt,
    shown,
    acked,
    status,
    pose,
    snapshot,
    revision,
    link,
    linkFailures,
    reconnected,
    armed,
    estop,
    passing,
    contact,
    dockReached,
    calling,
    callError,
    finished,
    counters,
    startSeq,
    current,
    callPoint,
    pauseReason,
    canDrive,
    finishing,
    /** The drift cloud's particles (not reactive: read when drawing). */
    cloud: () => belief?.cloud ?? null,
    /** The odometry trail as flat x, y pairs (NaN pairs mark re-anchorings). */
    trail: () => playback?.trail ?? [],
    markerName,
    load,
    setCommand,
    emergencyStop,
    acknowledgeContact,
    makeCall,
    submit: () => finish('submit'),
    abandon: () => finish('abandon'),
    retryNow: () => batcher?.retryNow(),
  };
}

export type DriveSession = ReturnType<typeof useDriveSession>;
