import { chmodSync, existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { CliError } from './errors.js';
import type { CliIo } from './io.js';

/** What `treadwise login` remembers. The key is a secret: the file is readable by its owner only. */
const storedLoginSchema = z.object({ apiUrl: z.string(), apiKey: z.string() });
export type StoredLogin = z.infer<typeof storedLoginSchema>;

export function loginFile(io: CliIo): string {
  return path.join(io.configDir(), 'login.json');
}

export function readLogin(io: CliIo): StoredLogin | null {
  const file = loginFile(io);
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw err;
  }
  try {
    return storedLoginSchema.parse(JSON.parse(text));
  } catch {
    throw new CliError(`${file} is not a Treadwise login; run treadwise logout, then treadwise login`);
  }
}

export function writeLogin(io: CliIo, login: StoredLogin): string {
  const file = loginFile(io);
  mkdirSync(path.dirname(file), { recursive: true, mode: 0o700 });
  writeFileSync(file, `${JSON.stringify(login, null, 2)}\n`, { mode: 0o600 });
  chmodSync(file, 0o600); // mode applies only when the file is created: tighten an older one too
  return file;
}

/** Forgets the login; false when there was none. */
export function removeLogin(io: CliIo): boolean {
  const file = loginFile(io);
  const existed = existsSync(file);
  rmSync(file, { force: true });
  return existed;
}
