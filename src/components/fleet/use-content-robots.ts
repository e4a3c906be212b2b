/** The content robots an employer can calibrate, with their nominal geometry. Loaded once per page load. */
import { onMounted, ref } from 'vue';
import { errorMessage, trialsApi } from '@/api';
import { robotsByName, type RobotGeometry } from './fleet-form';

let robotsPromise: Promise<RobotGeometry[]> | null = null;

export function loadContentRobots(): Promise<RobotGeometry[]> {
  if (!robotsPromise) {
    robotsPromise = trialsApi
      .robots()
      .then(({ items }) => robotsByName(items))
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
