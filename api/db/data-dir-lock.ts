import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { hostname } from 'node:os';
import path from 'node:path';
import lockfile from 'proper-lockfile';

/**
 * One server per data directory: PGlite does not lock its files, and two servers on one
 * directory each see only their own writes (one of them loses its confirmed writes at the next
 * start). The lock is a directory created atomically by proper-lockfile (`DATA_DIR/server.lock`),
 * with the holder's pid beside it (`DATA_DIR/server.pid`), so a restart after a crash or SIGKILL
 * can tell at once that the holder is gone instead of waiting for the lock to go stale.
 */
export class DataDirInUseError extends Error {}

export interface DataDirLock {
  release(): Promise<void>;
}

/**
 * The holder refreshes the lock's mtime every STALE_MS / 2. A lock untouched for STALE_MS is
 * taken over even without a pid (a holder on another host, or one that died between creating
 * the lock and writing its pid). Generous, so a busy event loop never loses its own lock.
 */
const STALE_MS = 30_000;
const UPDATE_MS = 10_000;

interface Holder {
  pid: number;
  host: string;
}

const lockPath = (dataDir: string) => path.join(dataDir, 'server.lock');
const pidPath = (dataDir: string) => path.join(dataDir, 'server.pid');

function readHolder(dataDir: string): Holder | undefined {
  try {
    const holder = JSON.parse(readFileSync(pidPath(dataDir), 'utf8')) as Partial<Holder>;
    return typeof holder.pid === 'number' && typeof holder.host === 'string' ? { pid: holder.pid, host: holder.host } : undefined;
  } catch {
    return undefined; // not written yet (the holder is starting) or unreadable
  }
}

/** False only when we know the holder is gone: same host, and no process with its pid (or it is us). */
function holderAlive(holder: Holder): boolean {
  if (holder.host !== hostname()) return true; // cannot look; the mtime rule covers it
  // A container restarts with the same pid: a lock that names us is left from our last life.
  if (holder.pid === process.pid) return false;
  try {
    process.kill(holder.pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM'; // alive, owned by another user
  }
}

async function acquire(dataDir: string, onCompromised: (err: Error) => void) {
  return lockfile.lock(dataDir, {
    lockfilePath: lockPath(dataDir),
    stale: STALE_MS,
    update: UPDATE_MS,
    retries: 0,
    realpath: false,
    onCompromised,
  });
}

/**
 * Takes the data directory or throws DataDirInUseError (one line, for the operator). A lock left
 * by a process that no longer exists is taken over at once. `onCompromised` is called if another
 * process removes or replaces the lock while we hold it.
 */
export async function lockDataDir(dataDir: string, onCompromised: (err: Error) => void): Promise<DataDirLock> {
  mkdirSync(dataDir, { recursive: true });
  let unlock: () => Promise<void>;
  try {
    unlock = await acquire(dataDir, onCompromised);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ELOCKED') throw err;
    const holder = readHolder(dataDir);
    if (!holder || holderAlive(holder)) {
      const who = holder ? ` (pid ${holder.pid}${holder.host === hostname() ? '' : ` on ${holder.host}`})` : '';
      throw new DataDirInUseError(
        `the data directory ${path.resolve(dataDir)} is in use by another Treadwise server${who}; stop it first or set another DATA_DIR`,
      );
    }
    // The holder died without releasing: clear its lock and take it. Read again just before, so
    // a server that took it over meanwhile (and wrote its own pid) is not thrown out.
    if (readHolder(dataDir)?.pid !== holder.pid) throw new DataDirInUseError(`the data directory ${path.resolve(dataDir)} was just taken by another Treadwise server`);
    rmSync(lockPath(dataDir), { recursive: true, force: true });
    unlock = await acquire(dataDir, onCompromised).catch((e: NodeJS.ErrnoException) => {
      if (e.code === 'ELOCKED') throw new DataDirInUseError(`the data directory ${path.resolve(dataDir)} was just taken by another Treadwise server`);
      throw e;
    });
  }
  writeFileSync(pidPath(dataDir), JSON.stringify({ pid: process.pid, host: hostname() } satisfies Holder));

  let released: Promise<void> | undefined;
  return {
    release: () =>
      (released ??= (async () => {
        // The pid goes first: a lock without a pid reads as "starting", never as "dead".
        rmSync(pidPath(dataDir), { force: true });
        await unlock();
      })()),
  };
}
