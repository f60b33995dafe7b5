import {
  closeSync,
  mkdirSync,
  openSync,
  readFileSync,
  rmSync,
  statSync,
  unlinkSync,
  writeSync,
} from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';

export const LOCK_FILE_NAME = '.reelwright.lock';

/** How often a holder refreshes its lock file; another host waits three of these. */
export const DEFAULT_HEARTBEAT_MS = 5_000;
/** How long a new opener waits for a holder on this host that is shutting down. */
export const DEFAULT_WAIT_MS = 3_000;

export interface LockInfo {
  pid: number;
  /** ISO instant the holder took the lock. */
  startedAt: string;
  hostname: string;
  /** Linux process start (clock ticks since boot) to tell a reused pid from the holder. */
  procStart?: string;
  /** The holder touches the file this often; absent in locks written before heartbeats. */
  heartbeatMs?: number;
}

export class DataDirInUseError extends Error {
  readonly holder: LockInfo;
  constructor(dataDir: string, holder: LockInfo, refreshedMsAgo?: number) {
    const refreshed =
      refreshedMsAgo === undefined
        ? ''
        : `, lock refreshed ${(refreshedMsAgo / 1000).toFixed(1)} s ago`;
    super(
      `The database folder ${dataDir} is in use by process ${holder.pid} ` +
        `(on ${holder.hostname}, since ${holder.startedAt}${refreshed}). The embedded database cannot be shared ` +
        'between processes: stop that process, or set DATABASE_URL to use a PostgreSQL server.',
    );
    this.name = 'DataDirInUseError';
    this.holder = holder;
  }
}

function procStat(pid: number): { state: string; start: string } | undefined {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // Fields after the parenthesised command name, which may hold spaces: state is field 3,
    // starttime field 22.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return { state: fields[0] ?? '', start: fields[19] ?? '' };
  } catch {
    return undefined;
  }
}

/** A process killed with SIGKILL keeps its pid while the kernel tears it down, then as a zombie. */
function dying(pid: number): boolean {
  const stat = procStat(pid);
  if (stat && (stat.state === 'Z' || stat.state === 'X')) return true;
  try {
    const status = readFileSync(`/proc/${pid}/status`, 'utf8');
    const pending = /^ShdPnd:\s*([0-9a-f]+)/m.exec(status)?.[1];
    // Bit 8 of the shared pending mask is signal 9.
    return pending !== undefined && (BigInt(`0x${pending}`) & 0x100n) !== 0n;
  } catch {
    return false;
  }
}

function isAliveHere(holder: LockInfo): boolean {
  try {
    process.kill(holder.pid, 0);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ESRCH') return false;
    // EPERM: alive, owned by another user.
  }
  if (dying(holder.pid)) return false;
  if (holder.procStart !== undefined) {
    const current = procStat(holder.pid)?.start;
    if (current !== undefined && current !== holder.procStart) return false;
  }
  return true;
}

function readLock(file: string): LockInfo | null {
  try {
    const parsed = JSON.parse(readFileSync(file, 'utf8')) as Partial<LockInfo>;
    if (typeof parsed.pid !== 'number') return null;
    return {
      pid: parsed.pid,
      startedAt: String(parsed.startedAt ?? 'unknown'),
      hostname: String(parsed.hostname ?? os.hostname()),
      procStart: parsed.procStart,
      heartbeatMs: typeof parsed.heartbeatMs === 'number' ? parsed.heartbeatMs : undefined,
    };
  } catch {
    return null;
  }
}

function mtimeMs(file: string): number | undefined {
  try {
    return statSync(file).mtimeMs;
  } catch {
    return undefined;
  }
}

const ageMs = (file: string) => Date.now() - (mtimeMs(file) ?? Date.now());
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

function tryCreate(file: string, info: LockInfo): boolean {
  let fd: number;
  try {
    fd = openSync(file, 'wx');
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'EEXIST') return false;
    throw error;
  }
  try {
    writeSync(fd, JSON.stringify(info));
  } finally {
    closeSync(fd);
  }
  return true;
}

type Verdict = { stale: true } | { stale: false; refreshedMsAgo?: number };

/**
 * Whether the holder is gone. On this host: its pid is dead, dying or reused (waiting a moment for
 * one shutting down). On another host, whose processes cannot be seen: the lock has not been
 * refreshed for three heartbeats, watched until it either is refreshed or goes stale.
 */
async function judge(file: string, holder: LockInfo, waitMs: number): Promise<Verdict> {
  if (holder.hostname === os.hostname()) {
    const until = Date.now() + waitMs;
    for (;;) {
      if (!isAliveHere(holder)) return { stale: true };
      if (Date.now() >= until) return { stale: false };
      await sleep(100);
    }
  }
  const limit = 3 * (holder.heartbeatMs ?? DEFAULT_HEARTBEAT_MS);
  const seen = mtimeMs(file);
  if (seen === undefined) return { stale: true };
  for (;;) {
    const now = mtimeMs(file);
    if (now === undefined) return { stale: true };
    if (now !== seen) return { stale: false, refreshedMsAgo: Math.max(0, Date.now() - now) };
    if (Date.now() - now > limit) return { stale: true };
    await sleep(Math.min(250, limit / 6));
  }
}

export interface FolderLock {
  readonly file: string;
  release(): void;
}

export interface LockOptions {
  /** How often this holder refreshes the lock (default 5 s). */
  heartbeatMs?: number;
  /** How long to wait for a holder on this host to exit (default 3 s). */
  waitMs?: number;
}

/**
 * Takes `<dataDir>/.reelwright.lock` exclusively, because PGlite itself lets two processes open
 * one folder and silently loses writes. A lock whose holder is gone is taken over.
 */
export async function lockDataDir(dataDir: string, options: LockOptions = {}): Promise<FolderLock> {
  const heartbeatMs = options.heartbeatMs ?? DEFAULT_HEARTBEAT_MS;
  const waitMs = options.waitMs ?? DEFAULT_WAIT_MS;
  mkdirSync(dataDir, { recursive: true });
  const file = path.join(dataDir, LOCK_FILE_NAME);
  const info: LockInfo = {
    pid: process.pid,
    startedAt: new Date().toISOString(),
    hostname: os.hostname(),
    procStart: procStat(process.pid)?.start,
    heartbeatMs,
  };
  const takeover = `${file}.takeover`;

  for (let attempt = 0; attempt < 5; attempt++) {
    if (tryCreate(file, info)) return holdLock(file, info);

    const holder = readLock(file);
    if (!holder) {
      // An unreadable lock may be one being written right now; only an old one is abandoned.
      if (ageMs(file) <= 5_000) {
        await sleep(50);
        continue;
      }
    } else {
      const verdict = await judge(file, holder, waitMs);
      if (!verdict.stale) throw new DataDirInUseError(dataDir, holder, verdict.refreshedMsAgo);
    }
    // Only one process may replace a stale lock, or two could each remove the other's new one.
    try {
      mkdirSync(takeover);
    } catch {
      if (ageMs(takeover) > 10_000) rmSync(takeover, { recursive: true, force: true });
      else await sleep(50);
      continue;
    }
    try {
      const again = readLock(file);
      if (JSON.stringify(again) === JSON.stringify(holder)) unlinkSync(file);
    } catch {
      // Already gone.
    } finally {
      rmSync(takeover, { recursive: true, force: true });
    }
  }
  const holder = readLock(file);
  if (holder) throw new DataDirInUseError(dataDir, holder);
  throw new Error(`Could not lock the database folder ${dataDir} (${file} is unreadable).`);
}

// Runs in a worker thread so that the heartbeat goes on while PGlite keeps the main thread busy
// (a long statement would otherwise look like a dead holder to another host).
const HEARTBEAT = `
const { workerData } = require('node:worker_threads');
const fs = require('node:fs');
const { file, pid, startedAt, heartbeatMs } = workerData;
const timer = setInterval(() => {
  try {
    const held = JSON.parse(fs.readFileSync(file, 'utf8'));
    if (held.pid !== pid || held.startedAt !== startedAt) return clearInterval(timer);
    const now = new Date();
    fs.utimesSync(file, now, now);
  } catch {
    clearInterval(timer);
  }
}, heartbeatMs);
`;

function holdLock(file: string, info: LockInfo): FolderLock {
  let held = true;
  const heartbeat = new Worker(HEARTBEAT, {
    eval: true,
    workerData: { file, pid: info.pid, startedAt: info.startedAt, heartbeatMs: info.heartbeatMs },
  });
  heartbeat.unref();
  heartbeat.on('error', (error) => console.error('[db] lock heartbeat stopped:', error.message));
  const release = () => {
    if (!held) return;
    held = false;
    process.off('exit', release);
    void heartbeat.terminate();
    try {
      const current = readLock(file);
      if (current && current.pid === info.pid && current.startedAt === info.startedAt)
        unlinkSync(file);
    } catch {
      // Nothing to release.
    }
  };
  process.on('exit', release);
  return { file, release };
}
