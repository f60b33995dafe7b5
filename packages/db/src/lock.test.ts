import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import {
  existsSync,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  rmSync,
  utimesSync,
  writeFileSync,
} from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { closeAllDbs, getDb, openDb } from './client';
import { DataDirInUseError, LOCK_FILE_NAME, lockDataDir } from './lock';

const escape = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
const holderScript = fileURLToPath(new URL('./test/lock-holder.ts', import.meta.url));
const children: ChildProcess[] = [];
const folders: string[] = [];

function tempDataDir(): string {
  const root = mkdtempSync(path.join(os.tmpdir(), 'rw-lock-'));
  folders.push(root);
  return path.join(root, 'pglite');
}

/** Starts a process that takes the folder lock, and resolves once it holds it. */
function holdLock(
  dir: string,
  mode?: 'exit' | 'busy',
  heartbeatMs?: number,
): Promise<ChildProcess> {
  const child = spawn(
    process.execPath,
    ['--import', 'tsx', holderScript, dir, ...(mode ? [mode] : [])],
    {
      stdio: ['ignore', 'pipe', 'inherit'],
      env: { ...process.env, LOCK_HEARTBEAT_MS: heartbeatMs ? String(heartbeatMs) : '' },
    },
  );
  children.push(child);
  return new Promise((resolve, reject) => {
    child.stdout!.on('data', (chunk: Buffer) => {
      if (chunk.toString().includes('locked')) resolve(child);
    });
    child.on('error', reject);
    child.on('exit', (code) => {
      if (mode === 'exit') resolve(child);
      else reject(new Error(`lock holder exited early with ${code}`));
    });
  });
}

function exited(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => child.once('exit', () => resolve()));
}

/** A lock written by a process on another machine sharing the folder (a container on a volume). */
const foreignLock = (heartbeatMs: number) => ({
  pid: 4242,
  startedAt: '2026-01-01T00:00:00.000Z',
  hostname: 'reel-host-b',
  heartbeatMs,
});

afterEach(async () => {
  for (const child of children.splice(0)) {
    if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
    await exited(child);
  }
  for (const root of folders.splice(0)) rmSync(root, { recursive: true, force: true });
});

describe('PGlite folder lock', () => {
  it('refuses a folder another live process holds, naming that process', async () => {
    const dir = tempDataDir();
    const holder = await holdLock(dir);
    const attempt = openDb({ dataDir: dir });
    await expect(attempt).rejects.toBeInstanceOf(DataDirInUseError);
    await expect(attempt).rejects.toThrow(
      new RegExp(
        `${escape(dir)} is in use by process ${holder.pid} \\(on ${escape(os.hostname())},.*DATABASE_URL`,
      ),
    );
  });

  it('takes over the lock of a process that was killed', async () => {
    const dir = tempDataDir();
    const holder = await holdLock(dir);
    holder.kill('SIGKILL');
    await exited(holder);
    // The killed holder could not clean up: its lock is still there, naming a dead pid.
    expect(JSON.parse(readFileSync(path.join(dir, LOCK_FILE_NAME), 'utf8')).pid).toBe(holder.pid);

    const lock = await lockDataDir(dir);
    expect(JSON.parse(readFileSync(lock.file, 'utf8')).pid).toBe(process.pid);
    lock.release();
    expect(existsSync(lock.file)).toBe(false);
  });

  it('takes over at once from a holder killed a moment ago, still being torn down', async () => {
    const dir = tempDataDir();
    const holder = await holdLock(dir);
    holder.kill('SIGKILL');
    // No waiting for the exit: a restart right after a kill -9 must come up.
    const lock = await lockDataDir(dir, { waitMs: 0 });
    expect(JSON.parse(readFileSync(lock.file, 'utf8')).pid).toBe(process.pid);
    lock.release();
  });

  it('takes over a lock from another host that is no longer refreshed', async () => {
    const dir = tempDataDir();
    mkdirSync(dir, { recursive: true });
    const file = path.join(dir, LOCK_FILE_NAME);
    writeFileSync(file, JSON.stringify(foreignLock(200)));
    const lock = await lockDataDir(dir);
    expect(JSON.parse(readFileSync(lock.file, 'utf8'))).toMatchObject({
      pid: process.pid,
      hostname: os.hostname(),
    });
    lock.release();
  });

  it('refuses a lock from another host that its holder keeps refreshing, naming the holder', async () => {
    const dir = tempDataDir();
    mkdirSync(dir, { recursive: true });
    const file = path.join(dir, LOCK_FILE_NAME);
    writeFileSync(file, JSON.stringify(foreignLock(100)));
    const touching = setInterval(() => {
      const now = new Date();
      utimesSync(file, now, now);
    }, 100);
    try {
      await expect(lockDataDir(dir)).rejects.toThrow(
        /is in use by process 4242 \(on reel-host-b, since 2026-01-01T00:00:00.000Z, lock refreshed/,
      );
    } finally {
      clearInterval(touching);
    }
    expect(JSON.parse(readFileSync(file, 'utf8')).hostname).toBe('reel-host-b');
  });

  it('keeps refreshing its lock while the holder’s main thread is busy', async () => {
    const dir = tempDataDir();
    await holdLock(dir, 'busy', 1000);
    // Seen from another host (same file, another host name), the blocked holder is still alive.
    const file = path.join(dir, LOCK_FILE_NAME);
    writeFileSync(
      file,
      JSON.stringify({ ...JSON.parse(readFileSync(file, 'utf8')), hostname: 'reel-host-b' }),
    );
    await expect(lockDataDir(dir)).rejects.toBeInstanceOf(DataDirInUseError);
  });

  it('takes over a stale lock left by a pid that no longer exists', async () => {
    const dir = tempDataDir();
    mkdirSync(dir, { recursive: true });
    const gone = spawnSync(process.execPath, ['-e', '']).pid;
    writeFileSync(
      path.join(dir, LOCK_FILE_NAME),
      JSON.stringify({ pid: gone, startedAt: '2026-01-01T00:00:00.000Z', hostname: os.hostname() }),
    );
    const lock = await lockDataDir(dir);
    expect(JSON.parse(readFileSync(lock.file, 'utf8')).pid).toBe(process.pid);
    lock.release();
  });

  it('is tried again by getDb once the holder is gone, rather than failing for good', async () => {
    const dir = tempDataDir();
    const holder = await holdLock(dir);
    await expect(getDb({ dataDir: dir })).rejects.toBeInstanceOf(DataDirInUseError);
    holder.kill('SIGKILL');
    await exited(holder);
    try {
      const handle = await getDb({ dataDir: dir });
      expect(handle.driver).toBe('pglite');
    } finally {
      await closeAllDbs();
    }
  });

  it('is released on close and when its holder exits', async () => {
    const dir = tempDataDir();
    const handle = await openDb({ dataDir: dir });
    const file = path.join(dir, LOCK_FILE_NAME);
    expect(existsSync(file)).toBe(true);
    // A second opener in the same process is refused too: two PGlite instances would still clash.
    await expect(openDb({ dataDir: dir })).rejects.toThrow(`in use by process ${process.pid}`);
    await handle.close();
    expect(existsSync(file)).toBe(false);

    // A holder that exits normally removes its lock on the way out.
    await exited(await holdLock(dir, 'exit'));
    expect(existsSync(file)).toBe(false);
    (await lockDataDir(dir)).release();
  });
});
