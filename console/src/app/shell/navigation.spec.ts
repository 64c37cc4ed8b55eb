import { describe, expect, it } from 'vitest';

import { destinationsFor } from './navigation.js';

const labels = (...args: Parameters<typeof destinationsFor>) => destinationsFor(...args).map((d) => d.label);

describe('destinationsFor', () => {
  it('offers the keys page to admins only (GET /v1/keys needs the admin role)', () => {
    expect(labels('admin')).toContain('Keys');
    expect(labels('estimator')).not.toContain('Keys');
    expect(labels('viewer')).not.toContain('Keys');
  });

  it('offers projects and the catalog to every role, since viewers may read both', () => {
    for (const role of ['admin', 'estimator', 'viewer'] as const) {
      expect(destinationsFor(role).map((d) => d.label)).toEqual(expect.arrayContaining(['Projects', 'Catalog']));
    }
  });

  it('offers batches to every role, since viewers may read jobs (GET /v1/batches needs the viewer role)', () => {
    for (const role of ['admin', 'estimator', 'viewer'] as const) expect(labels(role)).toContain('Batches');
  });

  it('always offers the status page', () => {
    expect(labels(null)).toEqual(['Status']);
  });

  it('offers traffic to every role (GET /v1/usage needs the viewer role)', () => {
    for (const role of ['admin', 'estimator', 'viewer'] as const) expect(labels(role)).toContain('Traffic');
  });

  it('offers team and activity to admins only (member changes and the audit trail need the admin role)', () => {
    expect(labels('admin')).toEqual(expect.arrayContaining(['Team', 'Activity']));
    expect(labels('estimator')).not.toContain('Team');
    expect(labels('viewer')).not.toContain('Activity');
  });

  it('offers billing to every role (GET /v1/billing needs the viewer role; only admins change the plan on the page)', () => {
    for (const role of ['admin', 'estimator', 'viewer'] as const) expect(labels(role)).toContain('Billing');
    expect(labels(null, true)).not.toContain('Billing'); // the operator acting in no organisation has no bill
  });

  it('offers the bench to estimators and admins, not viewers (the calculations need the estimator role)', () => {
    expect(labels('estimator')).toContain('Bench');
    expect(labels('admin')).toContain('Bench');
    expect(labels('viewer')).not.toContain('Bench');
  });

  it('shows the operator pages to the operator only, never to an admin', () => {
    expect(labels('admin')).not.toContain('Organisations');
    expect(labels('admin')).not.toContain('Mail outbox');
    expect(labels('admin', true)).toEqual(expect.arrayContaining(['Organisations', 'Mail outbox']));
    expect(labels(null, true)).toEqual(['Organisations', 'Mail outbox', 'Status']); // acting in no organisation
  });
});
