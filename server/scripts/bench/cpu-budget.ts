// A fixed share of a core for one app instance, as a container's CPU limit gives it: a Linux CPU
// cgroup with a CFS quota (cgroup v2's cpu.max, or v1's cpu.cfs_quota_us). The review's "two
// instances ÷ one" on a machine whose cores the app, PostgreSQL and the load generator already
// fill measures the machine, not the app; with every instance given the same budget, and the
// budgets together below what the machine has left, the ratio says whether a second process adds
// what it is given (nothing shared serialises them) — what scaling out onto more machines does.
// Needs root and a writable cgroup file system; elsewhere the budgeted rows are left out, saying so.
import fs from 'node:fs';
import path from 'node:path';

/** The quota's period: the kernel's default, as container runtimes use it. */
const PERIOD_US = 100_000;

export interface CpuBudget {
  /** Share of one core the processes in it may use together. */
  cores: number;
  /** Puts a process (all its threads: the event loop, libuv's pool, the GC's) under the budget. */
  add(pid: number): void;
  /** Moves its processes back to the top cgroup and removes it. */
  remove(): void;
}

type Hierarchy = { dir: string; limit: (group: string, cores: number) => void; root: string };

/** The writable CPU cgroup hierarchy of this machine, or the reason there is none. */
function hierarchy(): Hierarchy | string {
  const v2 = '/sys/fs/cgroup';
  const v1 = '/sys/fs/cgroup/cpu';
  try {
    if (fs.readFileSync(path.join(v2, 'cgroup.controllers'), 'utf8').split(/\s+/).includes('cpu')) {
      // The cpu controller must be on for the children of the top cgroup.
      fs.writeFileSync(path.join(v2, 'cgroup.subtree_control'), '+cpu');
      return { dir: v2, root: v2, limit: (g, cores) => fs.writeFileSync(path.join(g, 'cpu.max'), `${Math.round(cores * PERIOD_US)} ${PERIOD_US}`) };
    }
  } catch {
    // not cgroup v2 with the cpu controller: try v1
  }
  if (fs.existsSync(path.join(v1, 'cpu.cfs_quota_us'))) {
    return {
      dir: v1,
      root: v1,
      limit: (g, cores) => {
        fs.writeFileSync(path.join(g, 'cpu.cfs_period_us'), String(PERIOD_US));
        fs.writeFileSync(path.join(g, 'cpu.cfs_quota_us'), String(Math.round(cores * PERIOD_US)));
      },
    };
  }
  return 'no CPU cgroup on this machine';
}

/** A new budget of `cores` named `name`, or why it cannot be had (not root, a read-only cgroup file system, not Linux). */
export function cpuBudget(name: string, cores: number): CpuBudget | string {
  const h = hierarchy();
  if (typeof h === 'string') return h;
  const group = path.join(h.dir, `twistlog-bench-${name}-${process.pid}`);
  try {
    fs.mkdirSync(group);
    h.limit(group, cores);
  } catch (err) {
    try {
      fs.rmdirSync(group);
    } catch {
      // never made
    }
    return `cannot set a CPU quota (${(err as Error).message})`;
  }
  const members: number[] = [];
  return {
    cores,
    add(pid) {
      fs.writeFileSync(path.join(group, 'cgroup.procs'), String(pid));
      members.push(pid);
    },
    remove() {
      for (const pid of members) {
        try {
          fs.writeFileSync(path.join(h.root, 'cgroup.procs'), String(pid));
        } catch {
          // the process has ended
        }
      }
      fs.rmdirSync(group);
    },
  };
}
