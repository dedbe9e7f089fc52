// npm run dev: Vite with hot reload on :5173 and the API in watch mode on :3001, on the private cluster.
import path from 'node:path';
import { ensureNodeModules, launch, root, run, step } from './lib/steps.mjs';

ensureNodeModules();
const { preparePrivateDatabase } = await import('./lib/project.mjs');
const { env, cluster } = await preparePrivateDatabase();
const tsx = path.join(root, 'node_modules', '.bin', 'tsx');
const apiEnv = { ...env, NODE_ENV: 'development', PORT: process.env.API_PORT ?? '3001', SKEWBENCH_SHOW_DEMO: '1' };
step('applying database migrations…');
run(tsx, ['server/db/cli.ts', 'migrate'], { env: apiEnv });
run(tsx, ['server/db/cli.ts', 'seed'], { env: apiEnv });
step('starting the API (tsx watch) and Vite…');
const children = [
  launch(tsx, ['watch', '--clear-screen=false', 'server/index.ts'], { env: apiEnv }),
  launch(path.join(root, 'node_modules', '.bin', 'vite'), [], { env: { ...env, API_PORT: apiEnv.PORT } }),
];
let stopping = false;
function stop() {
  if (stopping) return;
  stopping = true;
  for (const child of children) child.kill('SIGTERM');
  setTimeout(() => {
    cluster?.stop();
    process.exit(0);
  }, 500);
}
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
for (const child of children) child.on('exit', stop);
