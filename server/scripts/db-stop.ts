/** `npm run db:stop`: stops the project-local PostgreSQL if it runs. */
import { loadConfig } from '../config';
import { stopLocalCluster } from './postgres';

const config = loadConfig();
console.log(stopLocalCluster(config.dataDir) ? 'PostgreSQL stopped.' : 'PostgreSQL was not running.');
