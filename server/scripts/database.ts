/** Where the database is: DATABASE_URL when set, else the project-local cluster (started on demand). */
import type { Config } from '../config';
import { ensureLocalCluster, recreateDatabase, type LocalCluster } from './postgres';

export async function localCluster(config: Config, log: (line: string) => void = console.log): Promise<LocalCluster> {
  return ensureLocalCluster({ dataRoot: config.dataDir, port: config.pgPort, log });
}

export async function resolveDatabaseUrl(config: Config, log: (line: string) => void = console.log): Promise<string> {
  if (config.databaseUrl) return config.databaseUrl;
  return (await localCluster(config, log)).urlFor('driftproof');
}

/** A freshly created database of the local cluster, for one test run. */
export async function freshTestDatabase(config: Config, name: string): Promise<string> {
  const cluster = await localCluster(config, () => {});
  await recreateDatabase(cluster, name);
  return cluster.urlFor(name);
}
