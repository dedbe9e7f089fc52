// The two measurements of one database: HTTP load on the API (autocannon) and the same SQL straight in
// PostgreSQL (pgbench), plus the server process and the sign-in they need.
import { spawn } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import autocannon from 'autocannon';
import { root } from '../lib/steps.mjs';

export const CONNECTIONS = 32;
export const DURATION_S = 20;

/** `node dist-server/server/index.js`, resolved once /api/health answers. */
export async function startServer(env) {
  const child = spawn(process.execPath, ['dist-server/server/index.js'], { cwd: root, env, stdio: ['ignore', 'ignore', 'inherit'] });
  const exited = new Promise((resolve) => child.once('exit', resolve));
  const base = `http://${env.HOST}:${env.PORT}`;
  for (let i = 0; i < 150; i++) {
    if (child.exitCode !== null) throw new Error(`the server exited with ${child.exitCode} before answering`);
    try {
      if ((await fetch(`${base}/api/health`)).ok) {
        const stop = () => {
          child.kill('SIGTERM');
          return exited;
        };
        return { child, base, stop };
      }
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  child.kill('SIGTERM');
  throw new Error('the server did not answer /api/health within 15 s');
}

/** Sign in as a lab script does: CSRF token, then sign-in with it; returns the session cookie header. */
export async function signIn(base, email, password) {
  const cookieOf = (res) => res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const csrf = await fetch(`${base}/api/auth/csrf`);
  const { token } = await csrf.json();
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': token, cookie: cookieOf(csrf) },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`);
  return cookieOf(res);
}

/**
 * autocannon on one URL, with a short unrecorded warm-up first so the JIT and the pools are settled; `cpu` takes
 * the CPU snapshots around the measured part (see cpu.mjs).
 */
export async function loadApi(url, cookie, cpu) {
  const headers = { cookie };
  await autocannon({ url, headers, connections: CONNECTIONS, duration: 3 });
  const before = cpu.snapshot();
  const r = await autocannon({ url, headers, connections: CONNECTIONS, duration: DURATION_S });
  const usage = cpu.report(before, cpu.snapshot(), r.requests.total);
  return { rps: r.requests.average, p50: r.latency.p50, p99: r.latency.p99, non2xx: r.non2xx, errors: r.errors + r.timeouts, ...usage };
}

/** SQL literals as Sequelize writes them for PostgreSQL replacements. */
function literal(value) {
  if (Array.isArray(value)) return value.map(literal).join(', ');
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  return `'${String(value).replace(/'/g, "''")}'`;
}

/** The route's SQL text (rangeQuery(true) from the built server) with its replacements filled in. */
export async function routeSql(replacements) {
  const sqlModule = path.join(root, 'dist-server/server/features/bookings/bookings.sql.js');
  const { rangeQuery } = await import(pathToFileURL(sqlModule).href);
  // `::` casts stay; only the named replacements are substituted.
  const sql = rangeQuery(true).replace(/(?<!:):([A-Za-z]\w*)\b/g, (match, name) => (name in replacements ? literal(replacements[name]) : match));
  const left = Object.keys(replacements).filter((name) => new RegExp(`(?<!:):${name}\\b`).test(sql));
  if (left.length) throw new Error(`replacements left in the SQL: ${left.join(', ')}`);
  return sql.trim();
}

/** pgbench (from the cluster's `bin` folder) with the route's SQL as its script; returns { tps, latencyMs }. */
export function runPgbench({ sql, file, connection, bin, onChild }) {
  writeFileSync(file, `${sql};\n`);
  const args = ['-n', '-f', file, '-c', String(CONNECTIONS), '-j', '2', '-T', String(DURATION_S),
    '-h', connection.host, '-p', String(connection.port), '-U', connection.user, connection.database];
  return new Promise((resolve, reject) => {
    const child = spawn(path.join(bin, 'pgbench'), args, { env: { ...process.env, PGPASSWORD: connection.password }, stdio: ['ignore', 'pipe', 'pipe'] });
    onChild?.(child);
    let out = '';
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (out += d));
    child.on('error', reject);
    child.on('exit', (code) => {
      const tps = out.match(/tps = ([\d.]+) \(without initial connection time\)/);
      const latency = out.match(/latency average = ([\d.]+) ms/);
      if (code !== 0 || !tps || !latency) reject(new Error(`pgbench failed (exit ${code}):\n${out}`));
      else resolve({ tps: Number(tps[1]), latencyMs: Number(latency[1]) });
    });
  });
}
