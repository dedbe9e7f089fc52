// The analysis part of the benchmark: analyseSetup in-process on a large setup (16 inputs, 4 sources, 8 segments
// per path), and POST /api/analysis under load on a running server.
//
//   npx tsx scripts/bench/analysis.ts          in-process only (no database)
//   npx tsx scripts/bench/analysis.ts --api    also the API: a throwaway cluster, the server in a child process
//
// From the main bench script (plain Node), with a server it started and a signed-in session:
//   const { tsImport } = await import('tsx/esm/api');
//   const { benchAnalysisApi, csrfTokenOf } = await tsImport('./bench/analysis.ts', import.meta.url);
//   const api = await benchAnalysisApi(`${base}/api/analysis`, cookie, await csrfTokenOf(base, cookie));
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { analyseSetup, type AnalysisDocument, type Segment } from '../../shared/domain/analysis.js';
import { SPEED_OF_LIGHT_M_PER_S as C } from '../../shared/domain/constants.js';

interface AutocannonResult {
  requests: { average: number };
  latency: { p50: number; p99: number };
  non2xx: number;
  errors: number;
  timeouts: number;
}
type Autocannon = (options: { url: string; method: 'POST'; headers: Record<string, string>; body: string; connections: number; duration: number }) => Promise<AutocannonResult>;
// autocannon ships no type declarations: require it with the shape this benchmark reads.
const autocannon = createRequire(import.meta.url)('autocannon') as Autocannon;

/** The start-up helpers (scripts/lib) are plain JavaScript; imported by URL, they come in untyped. */
const scriptLib = (name: string) => import(new URL(`../lib/${name}`, import.meta.url).href);

/** The in-process target: one analysis of the large setup in at most this many ms (median). */
export const TARGET_MEDIAN_MS = 0.2;
export const API_CONNECTIONS = 16;
export const API_DURATION_S = 15;

const ELEMENTS = 16;
const F0_HZ = 5e9;
const VF = 0.695; // RG-316-class PTFE cable (RF-PRIMER §1)
const spacingMm = (C / (2 * F0_HZ)) * 1e3;

/**
 * A 16-input bench of the size a lab actually wires: per source a generator cable, a 16-way splitter, a phase
 * cable whose extra length emulates the source's angle, a pad, three adapters/blocks and a short cable into the
 * probe. The chip is steered to the desired source and the null search covers a 0–500 ps chip in 1 ps steps.
 */
export function benchDocument(): AnalysisDocument {
  const sources = [
    { key: 'want', role: 'desired', frequencyHz: 5e9, powerDbm: -10, angleDeg: 10 },
    { key: 'jam', role: 'interferer', frequencyHz: 5.2e9, powerDbm: -5, angleDeg: -30 },
    { key: 'spur', role: 'other', frequencyHz: 4.8e9, powerDbm: -20, angleDeg: 45 },
    { key: 'leak', role: 'other', frequencyHz: 5.5e9, powerDbm: -30, angleDeg: -62 },
  ] as const;
  const extraMm = (deg: number, n: number) => n * spacingMm * Math.sin((deg * Math.PI) / 180) * VF;
  // Every path must be non-negative in length: offset each source's phase cables by the largest negative extra.
  const offsetMm = 15 * spacingMm * VF;
  const paths = sources.flatMap((s) =>
    Array.from({ length: ELEMENTS }, (_, channel) => {
      const segments: Segment[] = [
        { kind: 'cable', lengthMm: 1000, velocityFactor: VF, lossDbPerM: 0.9, lossRefHz: 1e9, tag: 'gen' },
        { kind: 'splitter', lossDb: 12.5, delayPs: 85, tag: 'split16' },
        { kind: 'cable', lengthMm: 300 + offsetMm + extraMm(s.angleDeg, channel), velocityFactor: VF, lossDbPerM: 0.9, lossRefHz: 1e9, tag: `ph${channel}` },
        { kind: 'attenuator', lossDb: 10, delayPs: 28 },
        { kind: 'adapter', lossDb: 0.1, delayPs: 14 },
        { kind: 'dc-block', lossDb: 0.2, delayPs: 31 },
        { kind: 'adapter', lossDb: 0.1, delayPs: 14 },
        { kind: 'cable', lengthMm: 150, dielectric: 'ptfe', lossDbPerM: 1.1, lossRefHz: 1e9, tag: 'probe' },
      ];
      return { source: s.key, channel, segments };
    }),
  );
  const steerPs = ((spacingMm * 1e-3 * Math.sin((10 * Math.PI) / 180)) / C) * 1e12;
  return {
    array: { elements: ELEMENTS, spacingHalfWavelengthAtHz: F0_HZ },
    sources: sources.map(({ key, role, frequencyHz, powerDbm }) => ({ key, role, frequencyHz, powerDbm })),
    paths,
    // Steered to the desired source: D_n − D_0 = −n·τ_s (RF-PRIMER §0), shifted so no delay is negative.
    combiner: { delaysPs: Array.from({ length: ELEMENTS }, (_, n) => (ELEMENTS - 1 - n) * steerPs) },
    inputs: Array.from({ length: ELEMENTS }, (_, channel) => ({ channel, maxInputDbm: 10 })),
    nullSearch: { interferer: 'jam', maxDelayPs: 500, stepPs: 1 },
  };
}

const quantile = (sorted: number[], q: number) => sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)]!;

/**
 * analyseSetup on the bench document, `runs` timed calls after `warmup` untimed ones; wall-clock median and
 * p99 per call, and the process's mean CPU time per call over the timed loop, garbage collection included (ms).
 * A wall median well above that mean means other processes held the CPU: on a shared machine, read both.
 */
export function benchAnalysisInProcess({ runs = 2000, warmup = 500 } = {}): { runs: number; medianMs: number; p99Ms: number; cpuMsPerRun: number } {
  const doc = benchDocument();
  // Keep each result reachable so the JIT cannot drop the call as dead code.
  let sink = 0;
  for (let i = 0; i < warmup; i++) sink += analyseSetup(doc).sources.length;
  const times: number[] = [];
  const cpuStart = process.cpuUsage();
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    sink += analyseSetup(doc).sources.length;
    times.push(performance.now() - start);
  }
  const cpu = process.cpuUsage(cpuStart);
  if (sink === 0) throw new Error('unreachable: every analysis has sources');
  times.sort((a, b) => a - b);
  return { runs, medianMs: quantile(times, 0.5), p99Ms: quantile(times, 0.99), cpuMsPerRun: (cpu.user + cpu.system) / 1000 / runs };
}

/** A fresh CSRF token of a signed-in session (sign-in regenerates the session, so the token changes). */
export async function csrfTokenOf(base: string, cookie: string): Promise<string> {
  const res = await fetch(`${base}/api/auth/csrf`, { headers: { cookie } });
  if (!res.ok) throw new Error(`GET /api/auth/csrf answered ${res.status}`);
  return ((await res.json()) as { token: string }).token;
}

export interface ApiLoad {
  rps: number;
  p50: number;
  p99: number;
  non2xx: number;
  errors: number;
  bodyBytes: number;
}

/**
 * POST /api/analysis with the bench document under load (autocannon, after a short unrecorded warm-up);
 * `url` is the endpoint, `cookie` a signed-in session's cookie header and `csrf` that session's token.
 */
export async function benchAnalysisApi(url: string, cookie: string, csrf: string, { connections = API_CONNECTIONS, durationS = API_DURATION_S } = {}): Promise<ApiLoad> {
  const body = JSON.stringify(benchDocument());
  const check = await fetch(url, { method: 'POST', headers: { cookie, 'x-csrf-token': csrf, 'content-type': 'application/json' }, body });
  if (check.status !== 200) throw new Error(`POST /api/analysis answered ${check.status}: ${await check.text()}`);
  const options = { url, method: 'POST' as const, headers: { cookie, 'x-csrf-token': csrf, 'content-type': 'application/json' }, body, connections };
  await autocannon({ ...options, duration: 3 });
  const r = await autocannon({ ...options, duration: durationS });
  return { rps: r.requests.average, p50: r.latency.p50, p99: r.latency.p99, non2xx: r.non2xx, errors: r.errors + r.timeouts, bodyBytes: body.length };
}

/** A throwaway cluster, the migrations, one bench researcher and the server (tsx) in a child process; then the load. */
async function runApiBench(): Promise<ApiLoad> {
  const { Cluster, freePort } = await scriptLib('postgres.mjs');
  const { root, run, step } = await scriptLib('steps.mjs');
  const { default: pg } = await import('pg');
  const { default: bcrypt } = await import('bcryptjs');

  const temp = mkdtempSync(path.join(os.tmpdir(), 'skewbench-bench-analysis-'));
  const cluster = new Cluster({ base: path.join(temp, 'pg'), port: await freePort(), password: randomBytes(12).toString('hex'), throwaway: true });
  let child: ChildProcess | null = null;
  try {
    cluster.init();
    cluster.start();
    const database = 'bench_analysis';
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
      UPLOADS_DIR: path.join(temp, 'uploads'),
    };
    mkdirSync(env.UPLOADS_DIR);
    const tsx: string = path.join(root, 'node_modules', '.bin', 'tsx');
    step(`${database}: applying the migrations…`);
    run(tsx, ['server/db/cli.ts', 'migrate'], { env, stdio: ['ignore', 'ignore', 'inherit'] });
    const email = 'bench-analysis@lab.test';
    const password = randomBytes(12).toString('hex');
    const client = new pg.Client(connection);
    await client.connect();
    await client.query(`INSERT INTO users (email, name, role, password_hash) VALUES ($1, 'Bench Researcher', 'researcher', $2)`, [email, await bcrypt.hash(password, 10)]);
    await client.end();

    step(`${database}: starting the server (tsx server/index.ts) on ${env.HOST}:${env.PORT}…`);
    // A process of its own, so the load generator does not share the server's event loop and skew its latency.
    child = spawn(tsx, ['server/index.ts'], { cwd: root, env, stdio: ['ignore', 'ignore', 'inherit'] });
    const base = `http://${env.HOST}:${env.PORT}`;
    for (let i = 0; ; i++) {
      if (child.exitCode !== null) throw new Error(`the server exited with ${child.exitCode} before answering`);
      if (i > 300) throw new Error('the server did not answer /api/health within 30 s');
      if (await fetch(`${base}/api/health`).then((r) => r.ok, () => false)) break;
      await new Promise((r) => setTimeout(r, 100));
    }
    const cookieOf = (res: Response) => res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const anonymous = await fetch(`${base}/api/auth/csrf`);
    const { token } = (await anonymous.json()) as { token: string };
    const signIn = await fetch(`${base}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-csrf-token': token, cookie: cookieOf(anonymous) },
      body: JSON.stringify({ email, password }),
    });
    if (signIn.status !== 200) throw new Error(`sign-in failed: ${signIn.status} ${await signIn.text()}`);
    const cookie = cookieOf(signIn);
    step(`POST /api/analysis: autocannon, ${API_CONNECTIONS} connections, ${API_DURATION_S} s (after a 3 s warm-up)…`);
    return await benchAnalysisApi(`${base}/api/analysis`, cookie, await csrfTokenOf(base, cookie));
  } finally {
    if (child && child.exitCode === null) {
      const exited = new Promise((resolve) => child!.once('exit', resolve));
      child.kill('SIGTERM');
      await exited;
    }
    cluster.stop();
    rmSync(temp, { recursive: true, force: true });
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const inProcess = benchAnalysisInProcess();
  const doc = benchDocument();
  const segments = doc.paths.reduce((sum, p) => sum + p.segments.length, 0);
  console.log(`\nanalyseSetup, ${doc.array.elements} inputs × ${doc.sources.length} sources, ${segments} segments, null search ${doc.nullSearch!.maxDelayPs} ps / ${doc.nullSearch!.stepPs} ps, 181-point pattern`);
  console.log(`  ${inProcess.runs} runs after warm-up: median ${inProcess.medianMs.toFixed(4)} ms, p99 ${inProcess.p99Ms.toFixed(4)} ms; mean CPU time ${inProcess.cpuMsPerRun.toFixed(4)} ms per run (GC included)`);
  console.log(`  ${os.cpus().length} cores (${os.cpus()[0]?.model ?? 'unknown'}), load average ${os.loadavg()[0]!.toFixed(2)}, Node ${process.version}`);
  console.log(`  target: median ≤ ${TARGET_MEDIAN_MS} ms: ${inProcess.medianMs <= TARGET_MEDIAN_MS ? 'met' : 'NOT met'}`);
  let code = inProcess.medianMs <= TARGET_MEDIAN_MS ? 0 : 1;
  if (process.argv.includes('--api')) {
    const api = await runApiBench();
    console.log(`\nPOST /api/analysis (${(api.bodyBytes / 1024).toFixed(1)} KiB body), ${API_CONNECTIONS} connections, ${API_DURATION_S} s`);
    console.log(`  ${api.rps.toFixed(0)} requests/s, p50 ${api.p50} ms, p99 ${api.p99} ms, non-2xx ${api.non2xx}, errors ${api.errors}`);
    if (api.non2xx + api.errors > 0) code = 1;
  }
  process.exit(code);
}
