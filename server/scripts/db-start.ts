/** `npm run db:start`: installs, initialises and starts the project-local PostgreSQL. */
import { loadConfig } from '../config';
import { localCluster } from './database';

const config = loadConfig();
const cluster = await localCluster(config);
console.log(`PostgreSQL 15 is running on ${cluster.host}:${cluster.port} (data in ${cluster.dataDir}).`);
