// CPU accounting from /proc, so a run says where its CPU went and how much the machine's other work took:
// on a shared 2-core machine that decides how far the figures can be trusted.
import { readFileSync, readdirSync } from 'node:fs';
import path from 'node:path';

const TICK_S = 0.01; // USER_HZ is 100 on Linux

/** Fields of /proc/PID/stat after the command name: [1] is the parent, [11..14] utime, stime, cutime, cstime. */
function stat(pid) {
  const text = readFileSync(`/proc/${pid}/stat`, 'utf8');
  return text.slice(text.lastIndexOf(')') + 2).split(' ').map(Number);
}

/** [pid, ppid, own CPU seconds, CPU seconds of its ended children] of every process. */
function processes() {
  const rows = [];
  for (const name of readdirSync('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    try {
      const f = stat(name);
      rows.push([Number(name), f[1], (f[11] + f[12]) * TICK_S, (f[13] + f[14]) * TICK_S]);
    } catch {
      // the process ended meanwhile
    }
  }
  return rows;
}

/** Busy CPU seconds of the whole machine. */
function machineBusy() {
  const [user, nice, system, , , irq, softirq, steal] = readFileSync('/proc/stat', 'utf8').split('\n')[0].trim().split(/\s+/).slice(1).map(Number);
  return (user + nice + system + irq + softirq + steal) * TICK_S;
}

/**
 * A snapshot of CPU seconds: the server process (null when none runs), the cluster (the postmaster's backends,
 * running or ended), this process with its ended children (pgbench, once reaped), the machine.
 */
export function cpuSnapshot(serverPid, cluster) {
  const postmaster = Number(readFileSync(path.join(cluster.data, 'postmaster.pid'), 'utf8').split('\n')[0]);
  let server = 0;
  let postgres = 0;
  for (const [pid, ppid, own, ended] of processes()) {
    if (pid === serverPid) server += own;
    if (pid === postmaster) postgres += own + ended;
    if (ppid === postmaster) postgres += own;
  }
  const self = stat('self');
  const selfSeconds = (self[11] + self[12] + self[13] + self[14]) * TICK_S;
  return { server, postgres, self: selfSeconds, machine: machineBusy(), at: performance.now() / 1000 };
}

/** CPU ms per request of server and PostgreSQL, and the share of the machine other processes used. */
export function cpuReport(before, after, requests, cores) {
  const d = (key) => after[key] - before[key];
  const ours = d('server') + d('postgres') + d('self');
  return {
    serverMs: (1000 * d('server')) / requests,
    postgresMs: (1000 * d('postgres')) / requests,
    othersShare: Math.max(0, d('machine') - ours) / (d('at') * cores),
  };
}
