// Spec data: the demo project of api/db/demo-data.ts as the API answers it. Every name is invented.
import type { EstimateChanges, EstimateRequest, Project, Stair } from '../core/api-types.js';

export const PROJECT_ID = '3b9d2f4e-6a1c-4e8b-9f2d-7c5a1e0b4d63';
export const STAIR_ID = '8e2c6a1f-4b7d-4c3e-a9f0-1d5b8e2c7a94';
export const ESTIMATE_ID = 'c4a7e1d9-2f6b-4a8c-b3e5-9d0f1a2b6c78';
export const USER_ID = '1f6d4c2a-8b3e-4f71-9a0c-5e2b7d9c1a34';

export const SALTMARSH_PROJECT: Project = {
  id: PROJECT_ID,
  name: 'Saltmarsh Cottage staircase',
  clientName: 'Wren & Tansy Holiday Lets',
  siteAddress: '4 Saltmarsh Row\nPort Aster',
  notes: null,
  stairCount: 1,
  createdBy: { type: 'user', id: USER_ID },
  createdAt: '2026-11-30T10:00:00.000Z',
  updatedAt: '2026-12-01T10:00:00.000Z',
};

/** The main stair's stored request: 12 treads of 1000 mm, Harbor Lane's 24 V strip and controller. */
export const SALTMARSH_INPUT: EstimateRequest = {
  layout: 'tread-strips',
  staircase: { treads: 12, treadWidthMm: 1000, riserHeightMm: 180, goingMm: 260 },
  treadStrip: { voltageV: 24, powerWPerM: 10, cutPitchMm: 50, sku: 'HL-S24-10' },
  controller: { profileId: 'HL-K20' },
  sensors: { motion: { outputType: 'pnp', supplyV: 5, currentMa: 8 } },
};

export const SALTMARSH_STAIR: Stair = {
  id: STAIR_ID,
  projectId: PROJECT_ID,
  name: 'Main stair',
  notes: null,
  input: SALTMARSH_INPUT,
  createdAt: '2026-12-01T10:00:00.000Z',
  updatedAt: '2026-12-01T10:00:00.000Z',
};

/** A re-run after a price change in the catalog: only the catalog version and the totals moved. */
export const PRICE_CHANGE: EstimateChanges = {
  changed: true,
  engineVersion: { old: '2.1.0', new: '2.1.0', changed: false },
  catalogVersion: { old: 21, new: 22, changed: true },
  currency: { old: 'EUR', new: 'EUR', changed: false },
  figures: {
    totalLoadW: { old: 119, new: 119, changed: false },
    driverCount: { old: 1, new: 1, changed: false },
    worstDropPercent: { old: 2.399, new: 2.399, changed: false },
    reels: { old: 3, new: 3, changed: false },
    bomTotal: { old: 310.4, new: 316.4, changed: true },
    gross: { old: 372.48, new: 379.68, changed: true },
  },
  checks: [],
};
