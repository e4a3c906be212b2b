/**
 * The content robots an employer can calibrate, read from the trials (a trial carries its
 * robot's nominal geometry): one trial per robot name is fetched, then the robots are listed
 * once each, by name. Loaded once per page load.
 */
import { onMounted, ref } from 'vue';
import { errorMessage, trialsApi, type TrialSummary } from '@/api';
import { uniqueRobots, type RobotGeometry } from './fleet-form';

let robotsPromise: Promise<RobotGeometry[]> | null = null;

/** One trial for each robot name (the first in the list). */
export function oneTrialPerRobot(trials: readonly TrialSummary[]): TrialSummary[] {
  const seen = new Set<string>();
  return trials.filter((t) => (seen.has(t.robotName) ? false : (seen.add(t.robotName), true)));
}

export function loadContentRobots(): Promise<RobotGeometry[]> {
  if (!robotsPromise) {
    robotsPromise = trialsApi
      .list()
      .then(({ items }) => Promise.all(oneTrialPerRobot(items).map((t) => trialsApi.get(t.id))))
      .then((answers) =>
        uniqueRobots(
          answers.map(({ trial: { robot } }) => ({
            id: robot.id,
            name: robot.name,
            wheelRadius: robot.wheelRadius,
            wheelbase: robot.wheelbase,
            ticksPerRevolution: robot.ticksPerRevolution,
          })),
        ),
      )
      .catch((error: unknown) => {
        robotsPromise = null;
        throw error;
      });
  }
  return robotsPromise;
}

export function useContentRobots() {
  const robots = ref<RobotGeometry[]>([]);
  const loading = ref(true);
  const failure = ref<string | null>(null);
  function load() {
    loading.value = true;
    failure.value = null;
    loadContentRobots()
      .then((items) => {
        robots.value = items;
      })
      .catch((error: unknown) => {
        failure.value = errorMessage(error);
      })
      .finally(() => {
        loading.value = false;
      });
  }
  onMounted(load);
  return { robots, loading, failure, load };
}
