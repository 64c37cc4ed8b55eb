import express from 'express';
import helmet from 'helmet';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { securityHeaders } from '../../api/middleware/security-headers.js';

const OPTIONS = { contentSecurityPolicy: { directives: { upgradeInsecureRequests: null } } };

/** An app that answers with whatever headers its first middleware set. */
const appWith = (first: express.RequestHandler) => express().use(first).get('/x', (_req, res) => res.json({ ok: true }));

describe('securityHeaders', () => {
  it('sets exactly the headers helmet sets, with the same values', async () => {
    const ours = await request(appWith(securityHeaders(OPTIONS))).get('/x').expect(200);
    const theirs = await request(appWith(helmet(OPTIONS))).get('/x').expect(200);
    const pick = (h: Record<string, string>) => Object.fromEntries(Object.entries(h).filter(([k]) => k !== 'date' && k !== 'etag'));
    expect(pick(ours.headers)).toEqual(pick(theirs.headers));
    expect(ours.headers['content-security-policy']).toContain("default-src 'self'");
    expect(ours.headers['content-security-policy']).not.toContain('upgrade-insecure-requests');
    expect(ours.headers['x-powered-by']).toBeUndefined();
  });
});
