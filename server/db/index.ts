import { Sequelize } from 'sequelize';
import { initModels } from './models';

/** One Sequelize instance per process, with every model registered. */
export function createDatabase(url: string, options: { poolMax?: number } = {}) {
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    logging: false,
    pool: { max: options.poolMax ?? 10, min: 0, idle: 10_000 },
  });
  initModels(sequelize);
  return sequelize;
}

/** True when the database answers a trivial query within the time limit. */
export async function databaseIsUp(sequelize: Sequelize, timeoutMs = 2000): Promise<boolean> {
  const timeout = new Promise<false>((resolve) => setTimeout(() => resolve(false), timeoutMs).unref());
  const probe = sequelize.query('SELECT 1').then(() => true as const, () => false as const);
  return Promise.race([probe, timeout]);
}
