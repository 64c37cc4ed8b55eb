import type { Session } from './api-types.js';
import type { SessionChannel, SessionMessage } from './session-channel.js';

/**
 * Test support: a broadcast bus between fake tabs in one realm, delivering to every tab but the
 * sender, as BroadcastChannel does. `hold()` keeps messages back to model a slow delivery.
 */
export class FakeSessionBus {
  private readonly tabs: Array<(m: SessionMessage) => void> = [];
  private held: Array<() => void> | null = null;

  channel(): SessionChannel {
    let own: ((m: SessionMessage) => void) | undefined;
    return {
      post: (message) => {
        for (const tab of this.tabs) if (tab !== own) this.deliver(() => tab(structuredClone(message)));
      },
      listen: (handler) => {
        own = handler;
        this.tabs.push(handler);
      },
    };
  }

  hold(): void {
    this.held = [];
  }

  release(): void {
    const pending = this.held ?? [];
    this.held = null;
    for (const send of pending) send();
  }

  private deliver(send: () => void): void {
    if (this.held) this.held.push(send);
    else send();
  }
}

/** A session answer in the API's shape; values are invented for specs. */
export function sessionAnswer(over: Partial<Session> & { role?: 'admin' | 'estimator' | 'viewer' } = {}): Session {
  const organization = { id: '0b7e4f1a-52c3-4d8e-9f60-1a2b3c4d5e6f', slug: 'harbor-lane', name: 'Harbor Lane Lighting' };
  const { role = 'admin', ...rest } = over;
  return {
    accessToken: 'access-1',
    accessTokenExpiresAt: '2026-12-02T09:15:00.000Z',
    refreshToken: 'refresh-2',
    refreshTokenExpiresAt: '2027-01-01T09:00:00.000Z',
    user: { id: '6c1d2e3f-4a5b-4c6d-8e7f-901234567890', email: 'mira@harborlane.test', name: 'Mira', operator: false },
    organization,
    memberships: [{ organization, role }],
    ...rest,
  };
}
