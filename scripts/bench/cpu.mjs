// CPU accounting from /proc, so a run says where its CPU went and how much the machine's other work took:
// on a shared 2-core machine that decides how far the figures can be trusted.
import { readFileSync, readdirSync } from 'node:fs';
import path from 'node:path';

const TICK_S = 0.01; // USER_HZ is 100 on Linux

/** [pid, ppid, cpu seconds] of every process. */
function processes() {
  const rows = [];
  for (const name of readdirSync('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    try {
      const stat = readFileSync(`/proc/${name}/stat`, 'utf8');
      const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      rows.push([Number(name), Number(f[1]), (Number(f[11]) + Number(f[12])) * TICK_S]);
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

/** A snapshot of CPU seconds: the server process, the cluster's processes, this process, the machine. */
export function cpuSnapshot(serverPid, cluster) {
  const postmaster = Number(readFileSync(path.join(cluster.data, 'postmaster.pid'), 'utf8').split('\n')[0]);
  let server = 0;
  let postgres = 0;
  for (const [pid, ppid, seconds] of processes()) {
    if (pid === serverPid) server += seconds;
    if (pid === postmaster || ppid === postmaster) postgres += seconds;
  }
  const self = process.cpuUsage();
  return { server, postgres, self: (self.user + self.system) / 1e6, machine: machineBusy() };
}

/** CPU ms per request of server and PostgreSQL, and the share of the machine other processes used. */
export function cpuReport(before, after, requests, seconds, cores) {
  const d = (key) => after[key] - before[key];
  const ours = d('server') + d('postgres') + d('self');
  return {
    serverMs: (1000 * d('server')) / requests,
    postgresMs: (1000 * d('postgres')) / requests,
    othersShare: Math.max(0, d('machine') - ours) / (seconds * cores),
  };
}
