// A private PostgreSQL cluster from Debian's packages, run by an unprivileged OS user
// (PostgreSQL refuses to run as root), listening on 127.0.0.1 only.
//
// Layout of a cluster folder BASE: BASE/data (PGDATA), BASE/run (socket), BASE/postgres.log.
import { chmodSync, chownSync, existsSync, mkdirSync, readdirSync, statSync, writeFileSync, rmSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { aptInstall, capture, isRoot, step } from './steps.mjs';

const DB_USER = 'skewbench';

/** Directory of the newest installed PostgreSQL server binaries, or null. */
export function findPostgresBin() {
  const base = '/usr/lib/postgresql';
  if (!existsSync(base)) return null;
  const versions = readdirSync(base)
    .filter((v) => existsSync(path.join(base, v, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(base, versions[0], 'bin') : null;
}

/** Make sure the server binaries exist, installing Debian's `postgresql` package when they do not. */
export function ensurePostgresInstalled() {
  let bin = findPostgresBin();
  if (bin) {
    step(`PostgreSQL server found in ${bin}`);
    return bin;
  }
  aptInstall(['postgresql'], 'the PostgreSQL server');
  bin = findPostgresBin();
  if (!bin) throw new Error('PostgreSQL was installed but its binaries are not in /usr/lib/postgresql/*/bin');
  return bin;
}

/** The OS account that owns and runs the cluster: `postgres` when we are root, else ourselves. */
function clusterOwner() {
  if (!isRoot) return null;
  const id = capture('id', ['-u', 'postgres']);
  if (id.status !== 0) {
    step('creating the unprivileged OS user "postgres" to run the database…');
    const made = capture('useradd', ['--system', '--no-create-home', '--shell', '/usr/sbin/nologin', 'postgres']);
    if (made.status !== 0) throw new Error(`could not create user postgres: ${made.stderr}`);
  }
  const uid = Number(capture('id', ['-u', 'postgres']).stdout.trim());
  const gid = Number(capture('id', ['-g', 'postgres']).stdout.trim());
  return { name: 'postgres', uid, gid };
}

function asOwner(owner, bin, program, args, cwd) {
  const exe = path.join(bin, program);
  return owner
    ? capture('runuser', ['-u', owner.name, '--', exe, ...args], { cwd })
    : capture(exe, args, { cwd });
}

/** The cluster's owner must be able to reach its folder: give ancestors search (x) permission if needed. */
function ensureTraversable(dir, owner) {
  if (!owner) return;
  const parts = path.resolve(dir).split(path.sep).filter(Boolean);
  let current = path.sep;
  for (const part of parts) {
    current = path.join(current, part);
    if (!existsSync(current)) break;
    const { mode, uid } = statSync(current);
    if (uid === owner.uid) continue;
    if ((mode & 0o001) === 0) {
      step(`letting the database user pass through ${current} (chmod o+x)`);
      chmodSync(current, mode | 0o001);
    }
  }
}

export class Cluster {
  /**
   * @param {{ base: string, port: number, password: string, throwaway?: boolean }} options
   * throwaway clusters (tests) trade durability for speed; the cluster that `npm start` keeps never does.
   */
  constructor({ base, port, password, throwaway = false }) {
    this.base = path.resolve(base);
    this.data = path.join(this.base, 'data');
    this.run = path.join(this.base, 'run');
    this.log = path.join(this.base, 'postgres.log');
    this.port = port;
    this.password = password;
    this.throwaway = throwaway;
    this.user = DB_USER;
    this.bin = ensurePostgresInstalled();
    this.owner = clusterOwner();
  }

  chownToOwner(p) {
    if (this.owner) chownSync(p, this.owner.uid, this.owner.gid);
  }

  /** initdb when the data folder is new; returns true when it created the cluster. */
  init() {
    if (existsSync(path.join(this.data, 'PG_VERSION'))) return false;
    step(`creating a private PostgreSQL cluster in ${this.data}…`);
    ensureTraversable(path.dirname(this.base), this.owner);
    mkdirSync(this.base, { recursive: true });
    for (const dir of [this.base, this.run]) {
      mkdirSync(dir, { recursive: true });
      chmodSync(dir, 0o700);
      this.chownToOwner(dir);
    }
    const pwfile = path.join(this.base, '.initdb-password');
    writeFileSync(pwfile, `${this.password}\n`, { mode: 0o600 });
    this.chownToOwner(pwfile);
    try {
      const result = asOwner(this.owner, this.bin, 'initdb', [
        '-D', this.data, '-U', this.user, `--pwfile=${pwfile}`,
        '--auth-local=trust', '--auth-host=scram-sha-256', '-E', 'UTF8', '--locale=C.UTF-8',
      ], this.base);
      if (result.status !== 0) throw new Error(`initdb failed:\n${result.stderr || result.stdout}`);
    } finally {
      rmSync(pwfile, { force: true });
    }
    return true;
  }

  isRunning() {
    if (!existsSync(path.join(this.data, 'postmaster.pid'))) return false;
    return asOwner(this.owner, this.bin, 'pg_ctl', ['status', '-D', this.data], this.base).status === 0;
  }

  start() {
    if (this.isRunning()) {
      step(`PostgreSQL is already running on 127.0.0.1:${this.port}`);
      return;
    }
    step(`starting PostgreSQL on 127.0.0.1:${this.port}…`);
    const settings = [`-c listen_addresses=127.0.0.1`, `-p ${this.port}`, `-k ${this.run}`];
    if (this.throwaway) settings.push('-c fsync=off', '-c synchronous_commit=off', '-c full_page_writes=off');
    const result = asOwner(this.owner, this.bin, 'pg_ctl', [
      '-D', this.data, '-l', this.log, '-w', '-t', '30', '-o', settings.join(' '), 'start',
    ], this.base);
    if (result.status !== 0) {
      const tail = capture('tail', ['-n', '20', this.log]).stdout;
      throw new Error(`PostgreSQL did not start (is port ${this.port} taken? set PGPORT):\n${tail}`);
    }
  }

  stop() {
    if (!this.isRunning()) return;
    step('stopping PostgreSQL…');
    asOwner(this.owner, this.bin, 'pg_ctl', ['-D', this.data, '-m', 'fast', '-w', 'stop'], this.base);
  }

  /** Connection settings for the app and for pg clients. */
  connection(database) {
    return { host: '127.0.0.1', port: this.port, user: this.user, password: this.password, database };
  }

  /** CREATE DATABASE when missing; returns true when it created it. */
  async createDatabase(database, { template } = {}) {
    const { default: pg } = await import('pg');
    const client = new pg.Client(this.connection('postgres'));
    await client.connect();
    try {
      const found = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [database]);
      if (found.rowCount) return false;
      const from = template ? ` TEMPLATE "${template}"` : '';
      await client.query(`CREATE DATABASE "${database}"${from}`);
      return true;
    } finally {
      await client.end();
    }
  }
}

/** A free TCP port on the loopback interface. */
export function freePort() {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.unref();
    server.on('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address();
      server.close(() => resolve(port));
    });
  });
}
