/**
 * Schema migrations and demo seeders through umzug. Both run under a PostgreSQL advisory lock,
 * so any number of web processes may start at once against one database.
 */
import type { Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug, type MigrationParams } from 'umzug';
import { migrations } from './migrations';
import { demoSeeders, type DemoOptions } from './seeders';

export interface Migration {
  name: string;
  up(params: MigrationParams<Sequelize>): Promise<void>;
  down?(params: MigrationParams<Sequelize>): Promise<void>;
}

const MIGRATION_LOCK = 0x44524946; // any constant shared by every process of this app

function umzugFor(sequelize: Sequelize, list: Migration[], tableName: string) {
  return new Umzug<Sequelize>({
    migrations: list,
    context: sequelize,
    storage: new SequelizeStorage({ sequelize, tableName }),
    logger: undefined,
  });
}

/** Holds a transaction-scoped advisory lock on one pooled connection while `work` runs on others. */
function withMigrationLock<T>(sequelize: Sequelize, work: () => Promise<T>): Promise<T> {
  return sequelize.transaction(async (transaction) => {
    await sequelize.query('SELECT pg_advisory_xact_lock(:key)', { replacements: { key: MIGRATION_LOCK }, transaction });
    return work();
  });
}

/** Applies pending migrations; returns the names applied. */
export function migrate(sequelize: Sequelize): Promise<string[]> {
  return withMigrationLock(sequelize, async () => {
    const done = await umzugFor(sequelize, migrations, 'sequelize_meta').up();
    return done.map((m) => m.name);
  });
}

/** Seeds the demo data, but only into a database that has no users yet. */
export function seedDemo(sequelize: Sequelize, options: DemoOptions): Promise<string[]> {
  return withMigrationLock(sequelize, async () => {
    const seedStore = umzugFor(sequelize, demoSeeders(options), 'sequelize_data');
    const [{ count }] = (await sequelize.query('SELECT count(*)::int AS count FROM users', { type: 'SELECT' })) as { count: number }[];
    if (count > 0 && (await seedStore.executed()).length === 0) return [];
    const done = await seedStore.up();
    return done.map((m) => m.name);
  });
}
