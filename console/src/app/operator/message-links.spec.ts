import { describe, expect, it } from 'vitest';

import { consolePath, messageParts } from './message-links.js';

describe('messageParts', () => {
  it('makes the invitation link of a message clickable and keeps the rest as text', () => {
    // The wording of api/services/members.ts's invitation e-mail.
    const text = 'Accept the invitation here (the link works once, until 2026-12-09T10:00:00.000Z):\nhttp://127.0.0.1:3000/accept-invitation?token=Xh2b-Q9_m\n\nIf you did not expect this, ignore this message.';
    expect(messageParts(text)).toEqual([
      { text: 'Accept the invitation here (the link works once, until 2026-12-09T10:00:00.000Z):\n' },
      { text: 'http://127.0.0.1:3000/accept-invitation?token=Xh2b-Q9_m', href: 'http://127.0.0.1:3000/accept-invitation?token=Xh2b-Q9_m' },
      { text: '\n\nIf you did not expect this, ignore this message.' },
    ]);
  });

  it('leaves a full stop or closing bracket after a link out of it', () => {
    expect(messageParts('See https://treadwise.test/docs.')).toEqual([{ text: 'See ' }, { text: 'https://treadwise.test/docs', href: 'https://treadwise.test/docs' }, { text: '.' }]);
    expect(messageParts('(https://treadwise.test/a)')).toEqual([{ text: '(' }, { text: 'https://treadwise.test/a', href: 'https://treadwise.test/a' }, { text: ')' }]);
  });

  it('never links another scheme', () => {
    expect(messageParts('javascript:alert(1) and ftp://x.test/y')).toEqual([{ text: 'javascript:alert(1) and ftp://x.test/y' }]);
  });
});

describe('consolePath', () => {
  it('turns a link to this console into a path, and leaves other sites alone', () => {
    expect(consolePath('http://127.0.0.1:3000/accept-invitation?token=abc', 'http://127.0.0.1:3000')).toBe('/accept-invitation?token=abc');
    expect(consolePath('https://elsewhere.test/accept-invitation?token=abc', 'http://127.0.0.1:3000')).toBeNull();
  });
});
