import type { ServerResponse } from 'node:http';

const HOOKS = Symbol('treadwise.answered');
type Hooked = ServerResponse & { [HOOKS]?: (() => void)[] };

/**
 * Runs `fn` once the answer is sent ('finish') or the client has gone ('close'), whichever comes
 * first, exactly once. Every per-request observer (access log, /metrics, usage meter) shares one
 * pair of listeners: adding two per observer was a measurable part of a small call.
 */
export function whenAnswered(res: ServerResponse, fn: () => void): void {
  const r = res as Hooked;
  const hooks = r[HOOKS];
  if (hooks) return void hooks.push(fn);
  const list = [fn];
  r[HOOKS] = list;
  let fired = false;
  const done = () => {
    if (fired) return;
    fired = true;
    // A hook added while the list runs (none today) still runs, after the others.
    for (let i = 0; i < list.length; i++) list[i]();
  };
  res.on('finish', done);
  res.on('close', done);
}
