// Small helpers shared by the start, dev and test scripts: progress lines, running commands,
// making sure npm dependencies and Debian packages are present.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

let started = Date.now();
/** Print one progress line: `[skewbench] step…` with the seconds since the script began. */
export function step(message) {
  const seconds = ((Date.now() - started) / 1000).toFixed(1).padStart(5);
  process.stdout.write(`[skewbench ${seconds}s] ${message}\n`);
}

/** Run a command to completion, inheriting the terminal; throws when it fails. */
export function run(command, args, options = {}) {
  const result = spawnSync(command, args, { stdio: 'inherit', cwd: root, ...options });
  if (result.error) throw result.error;
  if (result.status !== 0) {
    throw new Error(`${command} ${args.join(' ')} exited with ${result.status}`);
  }
  return result;
}

/** Run a command and capture its output; never throws, returns { status, stdout, stderr }. */
export function capture(command, args, options = {}) {
  const result = spawnSync(command, args, { encoding: 'utf8', cwd: root, ...options });
  return { status: result.status ?? 1, stdout: result.stdout ?? '', stderr: result.stderr ?? '' };
}

/** Spawn a long-running child that shares the terminal. */
export function launch(command, args, options = {}) {
  return spawn(command, args, { stdio: 'inherit', cwd: root, ...options });
}

export const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

/** npm ci when node_modules is missing or older than package-lock.json. */
export function ensureNodeModules() {
  const lock = path.join(root, 'package-lock.json');
  const marker = path.join(root, 'node_modules', '.package-lock.json');
  if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) {
    step('npm dependencies are installed');
    return;
  }
  step('installing npm dependencies (npm ci, about 20 s)…');
  run('npm', ['ci', '--no-audit', '--no-fund']);
}

/** Install Debian packages with apt-get, refreshing the package lists only when needed. */
export function aptInstall(packages, why) {
  if (!isRoot) {
    throw new Error(`${why} is missing. Install it with: sudo apt-get install -y ${packages.join(' ')}`);
  }
  step(`installing Debian package ${packages.join(' ')} (${why})…`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  const first = spawnSync('apt-get', ['install', '-y', '--no-install-recommends', ...packages], { stdio: 'inherit', env });
  if (first.status === 0) return;
  step('refreshing Debian package lists (apt-get update)…');
  run('apt-get', ['update'], { env });
  run('apt-get', ['install', '-y', '--no-install-recommends', ...packages], { env });
}
