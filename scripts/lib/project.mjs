// What start, dev and test have in common: the private cluster of this checkout, its secrets, the builds.
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { Cluster } from './postgres.mjs';
import { root, run, step } from './steps.mjs';

export const dataDir = path.join(root, '.data');
const bin = (name) => path.join(root, 'node_modules', '.bin', name);

/** Secrets generated once per checkout and kept in .data/secrets.json (never committed). */
export function projectSecrets() {
  const file = path.join(dataDir, 'secrets.json');
  mkdirSync(dataDir, { recursive: true });
  if (existsSync(file)) return JSON.parse(readFileSync(file, 'utf8'));
  const secrets = {
    dbPassword: randomBytes(18).toString('base64url'),
    sessionSecret: randomBytes(32).toString('base64url'),
  };
  writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 });
  return secrets;
}

/**
 * The environment for the server: the private cluster under .data/postgres (unless DATABASE_URL is set),
 * started and with its database created. Returns { env, cluster } (cluster is null with DATABASE_URL).
 */
export async function preparePrivateDatabase() {
  const secrets = projectSecrets();
  const env = { ...process.env, SESSION_SECRET: process.env.SESSION_SECRET ?? secrets.sessionSecret };
  if (process.env.DATABASE_URL) {
    step('using the database at DATABASE_URL (no private cluster)');
    return { env, cluster: null };
  }
  const port = Number(process.env.PGPORT ?? 54329);
  const database = process.env.PGDATABASE ?? 'skewbench';
  const cluster = new Cluster({ base: path.join(dataDir, 'postgres'), port, password: secrets.dbPassword });
  cluster.init();
  cluster.start();
  if (await cluster.createDatabase(database)) step(`created database "${database}"`);
  Object.assign(env, { PGHOST: '127.0.0.1', PGPORT: String(port), PGUSER: cluster.user, PGPASSWORD: cluster.password, PGDATABASE: database });
  return { env, cluster };
}

/** vite build into `outDir` (default dist/, which the server serves). */
export function buildClient(outDir = 'dist') {
  step(`building the client (vite build → ${outDir})…`);
  run(bin('vite'), ['build', '--logLevel', 'warn', '--outDir', outDir, '--emptyOutDir']);
}

export function buildServer() {
  step('compiling the server (tsc)…');
  run(bin('tsc'), ['-p', 'tsconfig.server.json']);
}
