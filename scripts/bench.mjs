// npm run bench: the calendar's range read (GET /api/bookings, one week, 10 instruments) under load through the
// API and, with the same SQL, straight in PostgreSQL, at 10k and 1M bookings, on a throwaway cluster.
// `node scripts/bench.mjs 10000` measures only the sizes given.
import { randomBytes } from 'node:crypto';
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ensureNodeModules, run, step } from './lib/steps.mjs';

ensureNodeModules();
const { Cluster, freePort } = await import('./lib/postgres.mjs');
const { buildServer } = await import('./lib/project.mjs');
const { BENCH_EMAIL, BENCH_PASSWORD, benchWeek, seedBench } = await import('./bench/seed.mjs');
const { CONNECTIONS, DURATION_S, loadApi, routeSql, runPgbench, signIn, startServer } = await import('./bench/load.mjs');
const { cpuReport, cpuSnapshot } = await import('./bench/cpu.mjs');

const sizes = process.argv.length > 2 ? process.argv.slice(2).map(Number) : [10_000, 1_000_000];
if (!sizes.every((n) => Number.isInteger(n) && n > 0)) {
  console.error('usage: node scripts/bench.mjs [bookings …]   e.g. node scripts/bench.mjs 10000 1000000');
  process.exit(2);
}
const TARGETS = { ratio: 0.35, p99Ms: 40, slowdown: 1.5 };

buildServer();
const temp = mkdtempSync(path.join(os.tmpdir(), 'skewbench-bench-'));
const cluster = new Cluster({ base: path.join(temp, 'pg'), port: await freePort(), password: randomBytes(12).toString('hex'), throwaway: true });
let server = null;
let pgbench = null;

// Idempotent and synchronous, so it also runs from a signal handler: nothing of the run outlives it.
let cleaned = false;
function cleanUp() {
  if (cleaned) return;
  cleaned = true;
  server?.child.kill('SIGTERM');
  pgbench?.kill('SIGTERM');
  cluster.stop();
  rmSync(temp, { recursive: true, force: true });
  step('throwaway cluster and temp folder removed');
}
for (const signal of ['SIGINT', 'SIGTERM']) {
  process.on(signal, () => {
    step(`${signal}: stopping`);
    cleanUp();
    process.exit(130);
  });
}

/** A database of `count` bookings, migrated and seeded, and the server environment for it. */
async function prepare(count) {
  const database = `bench_${count}`;
  await cluster.createDatabase(database);
  const connection = cluster.connection(database);
  const env = {
    ...process.env,
    NODE_ENV: 'production',
    SESSION_SECRET: randomBytes(32).toString('base64url'),
    LOG_LEVEL: 'warn',
    HOST: '127.0.0.1',
    PORT: String(await freePort()),
    PGHOST: connection.host,
    PGPORT: String(connection.port),
    PGUSER: connection.user,
    PGPASSWORD: connection.password,
    PGDATABASE: database,
    UPLOADS_DIR: path.join(temp, `uploads-${count}`),
  };
  mkdirSync(env.UPLOADS_DIR);
  step(`${database}: applying the migrations…`);
  run(process.execPath, ['dist-server/server/db/cli.js', 'migrate'], { env, stdio: ['ignore', 'ignore', 'inherit'] });
  const week = benchWeek();
  step(`${database}: seeding 1 researcher, 60 instruments and ${count.toLocaleString('en')} bookings (generate_series)…`);
  const seeded = await seedBench(connection, { count, week });
  // Every 4th instrument: ten of them, of mixed kinds.
  const instrumentIds = seeded.instrumentIds.filter((_, i) => i % 4 === 0).slice(0, 10);
  return { count, database, connection, env, week, userId: seeded.userId, instrumentIds };
}

/** The API under load: one server process, signed in, the week's URL. */
async function measureApi({ count, database, env, week, instrumentIds }) {
  step(`${database}: starting the server on ${env.HOST}:${env.PORT} and signing in…`);
  server = await startServer(env);
  const cookie = await signIn(server.base, BENCH_EMAIL, BENCH_PASSWORD);
  const url = `${server.base}/api/bookings?from=${encodeURIComponent(week.from)}&to=${encodeURIComponent(week.to)}&instrumentId=${instrumentIds.join(',')}`;
  const check = await fetch(url, { headers: { cookie } });
  if (check.status !== 200) throw new Error(`GET /api/bookings answered ${check.status}: ${await check.text()}`);
  const rows = (await check.json()).bookings.length;
  step(`${database}: the API returns ${rows} bookings for ${week.from.slice(0, 10)} … ${week.to.slice(0, 10)} (expected ${week.expectedRows})`);

  step(`${database}: autocannon, ${CONNECTIONS} connections, ${DURATION_S} s (after a 3 s warm-up)…`);
  const cores = os.cpus().length;
  const cpu = { snapshot: () => cpuSnapshot(server.child.pid, cluster), report: (a, b, n) => cpuReport(a, b, n, cores) };
  const api = await loadApi(url, cookie, cpu);
  step(`${database}: ${api.rps.toFixed(0)} requests/s, p50 ${api.p50} ms, p99 ${api.p99} ms, non-2xx ${api.non2xx}, errors ${api.errors}`);
  step(`${database}: CPU per request: server ${api.serverMs.toFixed(1)} ms, PostgreSQL ${api.postgresMs.toFixed(1)} ms; ` +
    `other processes on this machine took ${(100 * api.othersShare).toFixed(0)} % of its ${cores} cores meanwhile`);
  // autocannon stops with requests still queued in the server; let them finish before it stops.
  await new Promise((r) => setTimeout(r, 2000));
  step(`${database}: stopping the server…`);
  await server.stop();
  server = null;
  return { count, rows, ...api };
}

/** The route's SQL straight in PostgreSQL. */
async function measurePgbench({ count, database, connection, week, userId, instrumentIds }) {
  const sql = await routeSql({ from: week.from, to: week.to, instrumentIds, viewerId: userId, isManager: false, seesDetails: true });
  step(`${database}: pgbench with the route's SQL, ${CONNECTIONS} clients, ${DURATION_S} s…`);
  const before = cpuSnapshot(null, cluster);
  const db = await runPgbench({ sql, file: path.join(temp, `range-${count}.sql`), connection, bin: cluster.bin, onChild: (c) => (pgbench = c) });
  pgbench = null;
  const { othersShare } = cpuReport(before, cpuSnapshot(null, cluster), 1, os.cpus().length);
  step(`${database}: pgbench ${db.tps.toFixed(0)} TPS, latency average ${db.latencyMs} ms; other processes took ${(100 * othersShare).toFixed(0)} % meanwhile`);
  return { tps: db.tps, pgLatencyMs: db.latencyMs, pgOthersShare: othersShare };
}

function report(results) {
  const mark = (ok) => (ok ? 'met' : 'NOT met');
  const percent = (share) => `${(100 * share).toFixed(0)} %`;
  const table = [['bookings', 'rows', 'req/s', 'p50 ms', 'p99 ms', 'non-2xx', 'CPU ms/req srv+pg', 'others', 'pgbench TPS', 'others', 'API/pgbench']];
  for (const r of results) {
    table.push([r.count.toLocaleString('en'), r.rows, r.rps.toFixed(0), r.p50, r.p99, r.non2xx + r.errors,
      `${r.serverMs.toFixed(1)}+${r.postgresMs.toFixed(1)}`, percent(r.othersShare), r.tps.toFixed(0), percent(r.pgOthersShare), (r.rps / r.tps).toFixed(2)]);
  }
  const widths = table[0].map((_, c) => Math.max(...table.map((row) => String(row[c]).length)));
  console.log(`\nGET /api/bookings, one week × 10 instruments, ${CONNECTIONS} connections, ${DURATION_S} s, ${os.cpus().length} cores, ${new Date().toISOString().slice(0, 10)}`);
  for (const row of table) console.log(row.map((v, c) => (c === 0 ? String(v).padEnd(widths[c]) : String(v).padStart(widths[c]))).join('  '));
  const [small, large] = [results[0], results.at(-1)];
  const slowdown = small.rps / large.rps;
  const pair = `${large.count.toLocaleString('en')} vs ${small.count.toLocaleString('en')}`;
  if (results.length > 1) console.log(`slowdown ${pair} (requests/s): API ${slowdown.toFixed(2)}×, pgbench ${(small.tps / large.tps).toFixed(2)}×`);
  console.log('\ntargets:');
  for (const r of results) {
    console.log(`  ${r.count.toLocaleString('en')}: API/pgbench ≥ ${TARGETS.ratio}: ${mark(r.rps / r.tps >= TARGETS.ratio)}; ` +
      `p99 ≤ ${TARGETS.p99Ms} ms: ${mark(r.p99 <= TARGETS.p99Ms)}; non-2xx = 0: ${mark(r.non2xx + r.errors === 0)}`);
  }
  if (results.length > 1) console.log(`  slowdown ${pair} ≤ ${TARGETS.slowdown}×: ${mark(slowdown <= TARGETS.slowdown)}`);
}

let code = 1;
try {
  cluster.init();
  cluster.start();
  // All databases first, then the measurements back to back, so that the sizes are compared under the same
  // background load of the machine.
  const prepared = [];
  for (const count of sizes) prepared.push(await prepare(count));
  const results = [];
  for (const p of prepared) results.push(await measureApi(p));
  for (const [i, p] of prepared.entries()) Object.assign(results[i], await measurePgbench(p));
  report(results);
  code = results.every((r) => r.non2xx + r.errors === 0) ? 0 : 1;
} catch (err) {
  console.error(`\n[skewbench] benchmark failed: ${err.stack ?? err}`);
} finally {
  if (server) await server.stop();
  server = null;
  cleanUp();
}
process.exit(code);
