import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { openDb } from './client';
import { DataDirInUseError, LOCK_FILE_NAME, lockDataDir } from './lock';

const holderScript = fileURLToPath(new URL('./test/lock-holder.ts', import.meta.url));
const children: ChildProcess[] = [];
const folders: string[] = [];

function tempDataDir(): string {
  const root = mkdtempSync(path.join(os.tmpdir(), 'rw-lock-'));
  folders.push(root);
  return path.join(root, 'pglite');
}

/** Starts a process that takes the folder lock, and resolves once it holds it. */
function holdLock(dir: string, mode?: 'exit'): Promise<ChildProcess> {
  const child = spawn(
    process.execPath,
    ['--import', 'tsx', holderScript, dir, ...(mode ? [mode] : [])],
    {
      stdio: ['ignore', 'pipe', 'inherit'],
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
        `${dir.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')} is in use by process ${holder.pid}\\b.*DATABASE_URL`,
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

    const lock = lockDataDir(dir);
    expect(JSON.parse(readFileSync(lock.file, 'utf8')).pid).toBe(process.pid);
    lock.release();
    expect(existsSync(lock.file)).toBe(false);
  });

  it('takes over a stale lock left by a pid that no longer exists', () => {
    const dir = tempDataDir();
    mkdirSync(dir, { recursive: true });
    const gone = spawnSync(process.execPath, ['-e', '']).pid;
    writeFileSync(
      path.join(dir, LOCK_FILE_NAME),
      JSON.stringify({ pid: gone, startedAt: '2026-01-01T00:00:00.000Z', hostname: os.hostname() }),
    );
    const lock = lockDataDir(dir);
    expect(JSON.parse(readFileSync(lock.file, 'utf8')).pid).toBe(process.pid);
    lock.release();
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
    lockDataDir(dir).release();
  });
});
