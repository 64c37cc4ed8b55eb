import { describe, expect, it } from 'vitest';

import { ACTION_PATTERN, AUDIT_ACTION_GROUPS, actionLabel, actorLabel, dataPairs } from './audit-actions.js';

describe('audit action helpers', () => {
  it('offers only actions the API filter accepts', () => {
    for (const action of AUDIT_ACTION_GROUPS.flatMap((g) => g.actions)) expect(action).toMatch(ACTION_PATTERN);
  });

  it('reads an action as words', () => {
    expect(actionLabel('member.role_changed')).toBe('member role changed');
  });

  it('names the actor by kind and id', () => {
    expect(actorLabel({ type: 'api_key', id: 'h7kq2mzx4c5d' })).toBe('key h7kq2mzx4c5d');
    expect(actorLabel({ type: 'user', id: null })).toBe('user');
    expect(actorLabel({ type: 'system', id: null })).toBe('the system');
    expect(actorLabel({ type: 'user', id: 'u-theo' }, new Map([['u-theo', 'Theo (theo@harborlane.test)']]))).toBe('Theo (theo@harborlane.test)');
    expect(actorLabel({ type: 'user', id: 'u-gone' }, new Map())).toBe('user u-gone'); // a former member
  });

  it('shows nested data as JSON and strings as they are', () => {
    expect(dataPairs({ email: 'theo@harborlane.test', from: 'viewer', scopes: ['sizing:run'] })).toEqual([
      { name: 'email', value: 'theo@harborlane.test' },
      { name: 'from', value: 'viewer' },
      { name: 'scopes', value: '["sizing:run"]' },
    ]);
    expect(dataPairs(null)).toEqual([]);
  });
});
