import { spawn, type ChildProcess } from 'node:child_process';
import { once } from 'node:events';

export interface ServerProcess {
  url: string;
  stdout: () => string;
  stderr: () => string;
  pid: number;
  /** Sends SIGTERM and resolves with the exit code once the process has shut down. */
  stop(): Promise<number | null>;
  /** Sends a signal (SIGKILL: a crash) and resolves with the exit code, or the signal, once it is gone. */
  kill(signal: NodeJS.Signals): Promise<number | NodeJS.Signals | null>;
}

const SERVER_ENTRY = 'dist/server/main.js'; // built by `npm run build` before this suite

/** Starts the built server as `npm start` does, on a free port, and waits for its URL line. */
export async function startServerProcess(env: Record<string, string>): Promise<ServerProcess> {
  const child: ChildProcess = spawn(process.execPath, [SERVER_ENTRY], {
    env: { ...process.env, PORT: '0', HOST: '127.0.0.1', LOG_LEVEL: 'warn', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  let err = '';
  child.stdout!.on('data', (d) => (out += d));
  child.stderr!.on('data', (d) => (err += d));
  const url = await new Promise<string>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`server did not start:\n${out}\n${err}`)), 60_000);
    child.stdout!.on('data', () => {
      const m = /running at (http:\/\/\S+)/.exec(out);
      if (m) {
        clearTimeout(timer);
        resolve(m[1]);
      }
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`server exited with ${code}:\n${out}\n${err}`));
    });
  });
  return {
    url,
    stdout: () => out,
    stderr: () => err,
    pid: child.pid!,
    stop: async () => {
      if (child.exitCode !== null) return child.exitCode;
      const exited = once(child, 'exit');
      child.kill('SIGTERM');
      const [code] = await exited;
      return code as number | null;
    },
    kill: async (signal) => {
      if (child.exitCode !== null || child.signalCode !== null) return child.exitCode ?? child.signalCode;
      const exited = once(child, 'exit');
      child.kill(signal);
      const [code, sig] = await exited;
      return (code as number | null) ?? (sig as NodeJS.Signals | null);
    },
  };
}
