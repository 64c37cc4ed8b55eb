import { describe, expect, it } from 'vitest';

import { destinationsFor } from './navigation.js';

describe('destinationsFor', () => {
  it('offers the keys page to admins only (GET /v1/keys needs the admin role)', () => {
    expect(destinationsFor('admin').map((d) => d.label)).toContain('Keys');
    expect(destinationsFor('estimator').map((d) => d.label)).not.toContain('Keys');
    expect(destinationsFor('viewer').map((d) => d.label)).not.toContain('Keys');
  });

  it('offers projects and the catalog to every role, since viewers may read both', () => {
    for (const role of ['admin', 'estimator', 'viewer'] as const) {
      expect(destinationsFor(role).map((d) => d.label)).toEqual(expect.arrayContaining(['Projects', 'Catalog']));
    }
  });

  it('always offers the status page', () => {
    expect(destinationsFor(null).map((d) => d.label)).toEqual(['Status']);
  });
});
