// Where the machine's CPU went while a load round ran: each app instance, PostgreSQL (the bench
// cluster's postmaster and its backends) and the load generator (this process), from the kernel's
// per-process counters in /proc (Linux only; elsewhere the figures are left out). A ratio such as
// "two instances ÷ one" means little once the cores are all busy, so the bench prints this beside it.
import fs from 'node:fs';

/** Clock ticks a second of /proc's counters (USER_HZ: 100 on every Linux ABI in use). */
const TICKS_PER_SECOND = 100;

export interface CpuShare {
  /** Percent of one core, per part (a part may hold several processes). */
  parts: Record<string, number>;
  /** Percent of all the machine's cores busy (any process), and how many cores there are. */
  machineBusy: number;
  cores: number;
  /** Per part, the processes that were not there when the run began (new connections' backends, say). */
  started?: Record<string, number[]>;
}

/**
 * A process's /proc stat fields after its command name (which may itself hold spaces and
 * parentheses), or null when it has ended: [0] is field 3 (state), [1] ppid, [11] utime,
 * [12] stime, [13] and [14] the children's that have ended, in clock ticks.
 */
export function statFields(pid: number): string[] | null {
  try {
    const text = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
    return text.slice(text.lastIndexOf(')') + 2).split(' ');
  } catch {
    return null; // the process has ended
  }
}

function readStat(pid: number): { ppid: number; ticks: number } | null {
  const rest = statFields(pid);
  return rest ? { ppid: Number(rest[1]), ticks: Number(rest[11]) + Number(rest[12]) } : null;
}

/** CPU seconds (user + system) a live process has used. */
export function cpuSecondsOf(pid: number): number {
  const stat = readStat(pid);
  if (!stat) throw new Error(`process ${pid} has ended`);
  return stat.ticks / TICKS_PER_SECOND;
}

function allPids(): number[] {
  return fs
    .readdirSync('/proc')
    .filter((d) => /^\d+$/.test(d))
    .map(Number);
}

/** The postmaster listening on this port and its children (backends and helpers). */
export function postgresPids(port: number): number[] {
  const pids = allPids();
  const postmaster = pids.find((pid) => {
    try {
      const argv = fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0');
      return argv[0].endsWith('/postgres') && argv.some((a) => a === `port=${port}`);
    } catch {
      return false;
    }
  });
  if (postmaster === undefined) return [];
  return [postmaster, ...pids.filter((pid) => readStat(pid)?.ppid === postmaster)];
}

function machineTicks(): { busy: number; total: number; cores: number } {
  const stat = fs.readFileSync('/proc/stat', 'utf8');
  const [cpu] = stat.split('\n');
  const n = cpu.trim().split(/\s+/).slice(1).map(Number);
  // user nice system idle iowait irq softirq steal: idle and iowait are the idle ones.
  const total = n.slice(0, 8).reduce((a, b) => a + b, 0);
  return { busy: total - n[3] - n[4], total, cores: stat.match(/^cpu\d+ /gm)?.length ?? 1 };
}

function snapshot(parts: Record<string, () => number[]>) {
  const ticks: Record<string, Map<number, number>> = {};
  for (const [name, pids] of Object.entries(parts)) {
    ticks[name] = new Map(
      pids().flatMap((pid) => {
        const stat = readStat(pid);
        return stat ? [[pid, stat.ticks] as [number, number]] : [];
      }),
    );
  }
  return { ticks, machine: machineTicks(), at: performance.now() };
}

/**
 * Runs `work` and returns its result with the CPU each part used meanwhile. A process that started
 * during the run counts whole; one that ended during it is missed (PostgreSQL's pool keeps its
 * backends, the instances live through the run).
 */
export async function withCpuShare<T>(parts: Record<string, () => number[]>, work: () => Promise<T>): Promise<{ result: T; cpu: CpuShare | null }> {
  if (!fs.existsSync('/proc/stat')) return { result: await work(), cpu: null };
  const before = snapshot(parts);
  const result = await work();
  const after = snapshot(parts);
  const seconds = (after.at - before.at) / 1000;
  const share: Record<string, number> = {};
  const started: Record<string, number[]> = {};
  for (const name of Object.keys(parts)) {
    started[name] = [...after.ticks[name].keys()].filter((pid) => !before.ticks[name].has(pid));
    let ticks = 0;
    for (const [pid, t] of after.ticks[name]) ticks += t - (before.ticks[name].get(pid) ?? 0);
    share[name] = (ticks / TICKS_PER_SECOND / seconds) * 100;
  }
  const busy = after.machine.busy - before.machine.busy;
  const total = after.machine.total - before.machine.total;
  return {
    result,
    cpu: { parts: share, machineBusy: total > 0 ? (busy / total) * 100 : 0, cores: after.machine.cores, started },
  };
}

/** What a process is, from its command line ('postgres: autovacuum worker', say), or 'ended'. */
export function processTitle(pid: number): string {
  try {
    return fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0').filter(Boolean).join(' ');
  } catch {
    return 'ended';
  }
}

/** "app 62 %, PostgreSQL 15 %, load generator 95 % of a core; the 2 cores 97 % busy" */
export function describeCpu(cpu: CpuShare | null): string {
  if (!cpu) return 'not measured (no /proc)';
  const parts = Object.entries(cpu.parts)
    .map(([name, pct]) => `${name} ${Math.round(pct)} %`)
    .join(', ');
  return `${parts} of a core; the machine's ${cpu.cores} cores ${Math.round(cpu.machineBusy)} % busy`;
}
