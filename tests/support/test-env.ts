import { loadConfig, type Config } from '../../server/config.js';

export const TEMPLATE_DB = 'skewbench_template';

/** The throwaway cluster that `npm test` started; its coordinates come in TEST_PG* variables. */
export function testCluster() {
  const { TEST_PGHOST, TEST_PGPORT, TEST_PGUSER, TEST_PGPASSWORD } = process.env;
  if (!TEST_PGPORT || !TEST_PGUSER || TEST_PGPASSWORD === undefined) {
    throw new Error('The tests need the throwaway PostgreSQL cluster that `npm test` starts: run `npm test`, not vitest alone.');
  }
  return { host: TEST_PGHOST ?? '127.0.0.1', port: Number(TEST_PGPORT), user: TEST_PGUSER, password: TEST_PGPASSWORD };
}

/** Server configuration for a test database. */
export function testConfig(database: string, overrides: Record<string, string> = {}): Config {
  const c = testCluster();
  return loadConfig({
    NODE_ENV: 'test',
    LOG_LEVEL: 'silent',
    PGHOST: c.host,
    PGPORT: String(c.port),
    PGUSER: c.user,
    PGPASSWORD: c.password,
    PGDATABASE: database,
    SESSION_SECRET: 'test-session-secret-0123456789',
    // The demo's seeded photos live in the test run's own folder, never in the checkout's uploads/.
    UPLOADS_DIR: process.env.TEST_UPLOADS_DIR ?? '',
    // Each test app that runs the local mail capture takes a free port of its own.
    SMTP_CAPTURE_PORT: '0',
    ...overrides,
  });
}
