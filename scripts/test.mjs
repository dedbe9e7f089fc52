// npm test: the same set-up as npm start, a throwaway cluster on a free port, every suite, then clean up.
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { aptInstall, ensureNodeModules, launch, root, step } from './lib/steps.mjs';

ensureNodeModules();
const { Cluster, freePort } = await import('./lib/postgres.mjs');
const { buildClient } = await import('./lib/project.mjs');

if (!existsSync('/usr/bin/chromium')) aptInstall(['chromium'], "the browser for the browser tests, Debian's chromium");
else step('chromium found at /usr/bin/chromium');

const temp = mkdtempSync(path.join(os.tmpdir(), 'skewbench-test-'));
const cluster = new Cluster({ base: path.join(temp, 'pg'), port: await freePort(), password: randomBytes(12).toString('hex'), throwaway: true });
let code = 1;
try {
  cluster.init();
  cluster.start();
  // The tests' own build, so a running `npm start` or a second test run never sees a half-written dist/.
  const clientDist = path.join(temp, 'dist');
  buildClient(clientDist);
  step('running the test suites (vitest)…');
  const env = {
    ...process.env,
    NODE_ENV: 'test',
    TEST_PGHOST: '127.0.0.1',
    TEST_PGPORT: String(cluster.port),
    TEST_PGUSER: cluster.user,
    TEST_PGPASSWORD: cluster.password,
    TEST_CLIENT_DIST: clientDist,
    TEST_UPLOADS_DIR: path.join(temp, 'uploads'),
  };
  const vitest = launch(path.join(root, 'node_modules', '.bin', 'vitest'), ['run', ...process.argv.slice(2)], { env });
  const stop = () => vitest.kill('SIGTERM');
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
  code = await new Promise((resolve) => vitest.on('exit', (c) => resolve(c ?? 1)));
} catch (err) {
  console.error(`\n[skewbench] test set-up failed: ${err.message}`);
} finally {
  cluster.stop();
  rmSync(temp, { recursive: true, force: true });
  step(code === 0 ? 'all suites passed; throwaway cluster removed' : `tests failed (exit ${code}); throwaway cluster removed`);
}
process.exit(code);
