import pg from 'pg';
import { Sequelize } from 'sequelize';
import type { DbConfig } from '../config.js';
import { logger } from '../lib/logger.js';

/** Options for node-postgres shared by Sequelize and the session store's pool. */
export function pgOptions(db: DbConfig): pg.PoolConfig {
  const base: pg.PoolConfig = db.url
    ? { connectionString: db.url }
    : { host: db.host, port: db.port, user: db.user, password: db.password, database: db.database };
  return { ...base, connectionTimeoutMillis: 5000 };
}

/** The Sequelize instance of this process, over node-postgres. */
export function createSequelize(db: DbConfig): Sequelize {
  const options = {
    dialect: 'postgres' as const,
    logging: false as const,
    pool: { max: 10, min: 0, acquire: 10000, idle: 10000 },
    dialectOptions: { connectionTimeoutMillis: 5000 },
    define: { underscored: true },
  };
  return db.url
    ? new Sequelize(db.url, options)
    : new Sequelize(db.database, db.user, db.password, { ...options, host: db.host, port: db.port });
}

/** A node-postgres pool for the session store; its idle-client errors (database restarting) are logged, not fatal. */
export function createPgPool(db: DbConfig): pg.Pool {
  const pool = new pg.Pool({ ...pgOptions(db), max: 5 });
  pool.on('error', (err) => logger.warn(`session store connection lost: ${err.message}`));
  return pool;
}
