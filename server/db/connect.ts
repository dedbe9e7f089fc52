import type { Config } from '../config.js';
import { initModels } from './models.js';
import { createPgPool, createSequelize } from './sequelize.js';

/** Open this process's database handles: Sequelize with every model registered, and the session pool. */
export function connectDatabase(config: Config) {
  const sequelize = createSequelize(config.db);
  initModels(sequelize);
  const sessionPool = createPgPool(config.db);
  return {
    sequelize,
    sessionPool,
    async close() {
      await Promise.allSettled([sequelize.close(), sessionPool.end()]);
    },
  };
}
