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

export const LOCK_FILE_NAME = '.reelwright.lock';

export interface LockInfo {
  pid: number;
  /** ISO instant the holder took the lock. */
  startedAt: string;
  hostname: string;
  /** Linux process start (clock ticks since boot) to tell a reused pid from the holder. */
  procStart?: string;
}

export class DataDirInUseError extends Error {
  readonly holder: LockInfo;
  constructor(dataDir: string, holder: LockInfo) {
    super(
      `The database folder ${dataDir} is in use by process ${holder.pid} ` +
        `(on ${holder.hostname}, since ${holder.startedAt}). The embedded database cannot be shared ` +
        'between processes: stop that process, or set DATABASE_URL to use a PostgreSQL server.',
    );
    this.name = 'DataDirInUseError';
    this.holder = holder;
  }
}

function procStartOf(pid: number): string | undefined {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // Field 22 (starttime) counted after the parenthesised command name, which may hold spaces.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return fields[19];
  } catch {
    return undefined;
  }
}

function isAlive(holder: LockInfo): boolean {
  if (holder.hostname !== os.hostname()) return true; // cannot check: assume alive
  try {
    process.kill(holder.pid, 0);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ESRCH') return false;
    // EPERM: alive, owned by another user.
  }
  if (holder.procStart !== undefined) {
    const current = procStartOf(holder.pid);
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
    };
  } catch {
    return null;
  }
}

function ageMs(file: string): number {
  try {
    return Date.now() - statSync(file).mtimeMs;
  } catch {
    return 0;
  }
}

function sleep(ms: number): void {
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms);
}

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

export interface FolderLock {
  readonly file: string;
  release(): void;
}

/**
 * Takes `<dataDir>/.reelwright.lock` exclusively, because PGlite itself lets two processes open
 * one folder and silently loses writes. A lock whose holder is dead is taken over.
 */
export function lockDataDir(dataDir: string): FolderLock {
  mkdirSync(dataDir, { recursive: true });
  const file = path.join(dataDir, LOCK_FILE_NAME);
  const info: LockInfo = {
    pid: process.pid,
    startedAt: new Date().toISOString(),
    hostname: os.hostname(),
    procStart: procStartOf(process.pid),
  };
  const takeover = `${file}.takeover`;

  for (let attempt = 0; attempt < 5; attempt++) {
    if (tryCreate(file, info)) return holdLock(file, info);

    const holder = readLock(file);
    // An unreadable lock may be one being written right now; only an old one is abandoned.
    const stale = holder ? !isAlive(holder) : ageMs(file) > 5_000;
    if (!stale) {
      if (holder) throw new DataDirInUseError(dataDir, holder);
      sleep(50);
      continue;
    }
    // Only one process may replace a stale lock, or two could each remove the other's new one.
    try {
      mkdirSync(takeover);
    } catch {
      if (ageMs(takeover) > 10_000) rmSync(takeover, { recursive: true, force: true });
      else sleep(50);
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

function holdLock(file: string, info: LockInfo): FolderLock {
  let held = true;
  const release = () => {
    if (!held) return;
    held = false;
    process.off('exit', release);
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
