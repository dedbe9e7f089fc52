// npm start: set everything up on a fresh machine, then run Skewbench with the demo lab.
import { ensureNodeModules, launch, root, run, step } from './lib/steps.mjs';

ensureNodeModules();
const { buildClient, buildServer, preparePrivateDatabase } = await import('./lib/project.mjs');

let cluster = null;
try {
  const prepared = await preparePrivateDatabase();
  cluster = prepared.cluster;
  const env = { ...prepared.env, NODE_ENV: process.env.NODE_ENV ?? 'production' };
  buildClient();
  buildServer();
  step('applying database migrations…');
  run(process.execPath, ['dist-server/server/db/cli.js', 'migrate'], { env });
  step('seeding the demo lab when the database is empty…');
  run(process.execPath, ['dist-server/server/db/cli.js', 'seed'], { env });
  step('starting the web server…');
  const server = launch(process.execPath, ['dist-server/server/index.js'], { env: { ...env, SKEWBENCH_SHOW_DEMO: '1' }, cwd: root });
  const forward = (signal) => server.kill(signal);
  process.on('SIGINT', forward);
  process.on('SIGTERM', forward);
  const code = await new Promise((resolve) => server.on('exit', (c) => resolve(c ?? 0)));
  step('web server stopped');
  cluster?.stop();
  process.exit(code);
} catch (err) {
  console.error(`\n[skewbench] start failed: ${err.message}`);
  cluster?.stop();
  process.exit(1);
}
