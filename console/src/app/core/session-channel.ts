import { InjectionToken } from '@angular/core';

import type { SessionState } from './session-state.js';

/** What one tab tells the others about the shared sign-in. */
export type SessionMessage = { type: 'renewed'; state: SessionState } | { type: 'signed-out' };

export interface SessionChannel {
  post(message: SessionMessage): void;
  listen(handler: (message: SessionMessage) => void): void;
}

/** A BroadcastChannel between this origin's tabs; silent where the browser has none. */
export function browserSessionChannel(): SessionChannel {
  if (typeof BroadcastChannel === 'undefined') return { post: () => undefined, listen: () => undefined };
  const channel = new BroadcastChannel('treadwise-session');
  return {
    post: (message) => channel.postMessage(message),
    listen: (handler) => channel.addEventListener('message', (event: MessageEvent<SessionMessage>) => handler(event.data)),
  };
}

export const SESSION_CHANNEL = new InjectionToken<SessionChannel>('SESSION_CHANNEL', {
  providedIn: 'root',
  factory: () => browserSessionChannel(),
});
