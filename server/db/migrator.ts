import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug, type MigrationFn } from 'umzug';
import { logger } from '../lib/logger.js';

export type Migration = MigrationFn<QueryInterface>;

const here = path.dirname(fileURLToPath(import.meta.url));

/**
 * Umzug over server/db/migrations, recorded in the `schema_migrations` table.
 * Names are stored without their extension, so the TypeScript sources (tsx) and the compiled
 * JavaScript (production) are the same migrations.
 */
export function createMigrator(sequelize: Sequelize) {
  return new Umzug<QueryInterface>({
    migrations: {
      glob: ['migrations/*.{ts,js}', { cwd: here, ignore: ['**/*.d.ts'] }],
      resolve: ({ name, path: file, context }) => {
        const load = async () => (await import(pathToFileURL(file!).href)) as { up: Migration; down: Migration };
        return {
          name: name.replace(/\.(ts|js)$/, ''),
          up: async () => (await load()).up({ name, path: file, context }),
          down: async () => (await load()).down({ name, path: file, context }),
        };
      },
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: { info: (m) => logger.debug(JSON.stringify(m)), warn: (m) => logger.warn(JSON.stringify(m)), error: (m) => logger.error(JSON.stringify(m)), debug: () => {} },
  });
}

/** Apply every pending migration in order; returns the names applied. */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const applied = await createMigrator(sequelize).up();
  return applied.map((m) => m.name);
}
