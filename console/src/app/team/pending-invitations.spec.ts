import { describe, expect, it } from 'vitest';

import type { AuditEvent, Member } from '../core/api-types.js';
import { pendingInvitations } from './pending-invitations.js';

const NOW = new Date('2026-12-02T10:00:00.000Z');

// Audit events in the API's shape (api/routes/members.ts and auth.ts record these); addresses are invented.
function invited(email: string, createdAt: string, expiresAt: string, role = 'viewer'): AuditEvent {
  return {
    id: `ev-${email}-${createdAt}`,
    action: 'member.invited',
    actor: { type: 'user', id: 'u-mira' },
    target: { type: 'invitation', id: `inv-${email}-${createdAt}` },
    requestId: null,
    ip: null,
    data: { email, role, expiresAt },
    createdAt,
  };
}
function joined(email: string, createdAt: string): AuditEvent {
  return { ...invited(email, createdAt, createdAt), action: 'member.joined', target: { type: 'member', id: 'm-1' }, data: { email, role: 'viewer' } };
}
const member = (email: string): Member => ({ id: `m-${email}`, userId: `u-${email}`, email, name: null, role: 'viewer', createdAt: '2026-11-01T00:00:00.000Z' });

describe('pendingInvitations', () => {
  it('lists an invitation sent and not yet accepted', () => {
    const pending = pendingInvitations([invited('rowan@harborlane.test', '2026-12-01T09:00:00.000Z', '2026-12-08T09:00:00.000Z', 'estimator')], [], [], NOW);
    expect(pending).toEqual([
      { id: 'inv-rowan@harborlane.test-2026-12-01T09:00:00.000Z', email: 'rowan@harborlane.test', role: 'estimator', expiresAt: '2026-12-08T09:00:00.000Z', sentAt: '2026-12-01T09:00:00.000Z' },
    ]);
  });

  it('keeps only the newest invitation per address (a resend replaces the earlier link)', () => {
    const pending = pendingInvitations(
      [invited('rowan@harborlane.test', '2026-12-02T08:00:00.000Z', '2026-12-09T08:00:00.000Z', 'admin'), invited('rowan@harborlane.test', '2026-12-01T09:00:00.000Z', '2026-12-08T09:00:00.000Z')],
      [],
      [],
      NOW,
    );
    expect(pending.map((p) => [p.email, p.role])).toEqual([['rowan@harborlane.test', 'admin']]);
  });

  it('drops invitations that expired, were accepted, or whose address is a member now', () => {
    const pending = pendingInvitations(
      [
        invited('old@harborlane.test', '2026-11-20T09:00:00.000Z', '2026-11-27T09:00:00.000Z'),
        invited('joined@harborlane.test', '2026-12-01T09:00:00.000Z', '2026-12-08T09:00:00.000Z'),
        invited('member@harborlane.test', '2026-12-01T09:00:00.000Z', '2026-12-08T09:00:00.000Z'),
      ],
      [joined('joined@harborlane.test', '2026-12-01T12:00:00.000Z')],
      [member('Member@HarborLane.test')],
      NOW,
    );
    expect(pending).toEqual([]);
  });

  it('lists a new invitation for someone who joined earlier and has since been removed', () => {
    const pending = pendingInvitations(
      [invited('back@harborlane.test', '2026-12-02T09:00:00.000Z', '2026-12-09T09:00:00.000Z')],
      [joined('back@harborlane.test', '2026-11-10T09:00:00.000Z')],
      [],
      NOW,
    );
    expect(pending.map((p) => p.email)).toEqual(['back@harborlane.test']);
  });

  it('skips events whose data lacks what an invitation needs', () => {
    const broken = { ...invited('x@harborlane.test', '2026-12-01T09:00:00.000Z', '2026-12-08T09:00:00.000Z'), data: { email: 'x@harborlane.test' } };
    expect(pendingInvitations([broken], [], [], NOW)).toEqual([]);
  });
});
