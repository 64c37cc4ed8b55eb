import type { Scope } from '../auth/scopes.js';
import { harborLaneCatalog, hlM05Motion, hlS2410Strip } from '../../shared/schemas/estimate-examples.js';

/** The invented demo scenario (see DEVELOPERS.md); every name here is made up. */
export const demoOrganizations = [
  { slug: 'harbor-lane', name: 'Harbor Lane Lighting', planId: 'shop', embedOrigins: ['https://shop.harborlane.test'] },
  { slug: 'kestrel-finch', name: 'Kestrel & Finch Builders', planId: 'free', embedOrigins: ['https://plans.kestrelfinch.test'] },
  { slug: 'quayside-studio', name: 'Quayside Studio', planId: 'free', embedOrigins: ['https://quayside.test'] },
] as const;

/**
 * Demo sign-ins. One documented password for every demo account (printed at the first start);
 * the seed never runs against a database that holds anything, nor by default on a real server.
 */
export const DEMO_PASSWORD = 'treadwise-demo';

/** The organisation whose shop the local demo shop plays (demo-scenario.md: Harbor Lane). */
export const DEMO_SHOP_ORGANIZATION = 'harbor-lane';

export const demoOperator = { email: 'ops@treadwise.test', name: 'Treadwise operations' };

export const demoMembers = [
  { organization: 'harbor-lane', email: 'mira@harborlane.test', name: 'Mira', role: 'admin' },
  { organization: 'harbor-lane', email: 'theo@harborlane.test', name: 'Theo', role: 'estimator' },
  { organization: 'harbor-lane', email: 'ines@harborlane.test', name: 'Ines', role: 'viewer' },
  { organization: 'kestrel-finch', email: 'ava@kestrelfinch.test', name: 'Ava', role: 'admin' },
  { organization: 'kestrel-finch', email: 'jonas@kestrelfinch.test', name: 'Jonas', role: 'estimator' },
  { organization: 'quayside-studio', email: 'noor@quaysidestudio.test', name: 'Noor', role: 'admin' },
] as const;

/** Server-side demo keys: everything a partner's server needs, but not key management. */
export const demoServerKeyScopes: Scope[] = ['sizing:run', 'projects:read', 'projects:write', 'catalog:read', 'batches:write', 'batches:read', 'usage:read'];

/** Demo page keys: sizing, and the shop's active catalog items for the embeddable estimator. */
export const demoEmbedKeyScopes: Scope[] = ['sizing:run', 'catalog:read'];

/**
 * Stored catalogs of the demo: Harbor Lane's is the inline example catalog (EUR), with a tax rate
 * invented for the demo so net, tax and gross differ.
 */
export const demoCatalogs = [{ organization: 'harbor-lane', currency: harborLaneCatalog.currency, taxRatePercent: 20, items: harborLaneCatalog.items }] as const;

/**
 * A demo project of Harbor Lane: a customer's stair kept to run, re-run after a price change and
 * hand over. Client, site and stair are invented.
 */
export const demoProjects = [
  {
    organization: 'harbor-lane',
    createdBy: 'theo@harborlane.test',
    name: 'Saltmarsh Cottage staircase',
    clientName: 'Wren & Tansy Holiday Lets',
    siteAddress: '4 Saltmarsh Row\nPort Aster',
    notes: 'Oak treads, warm white. Mains side of the drivers by the client’s electrician.',
    stairs: [
      {
        name: 'Main stair',
        input: {
          layout: 'tread-strips',
          staircase: { treads: 12, treadWidthMm: 1000, riserHeightMm: 180, goingMm: 260 },
          treadStrip: hlS2410Strip,
          // The shop's controller by SKU: the stored catalog gives its profile and prices it.
          controller: { profileId: 'HL-K20' },
          sensors: { motion: hlM05Motion },
        },
      },
    ],
  },
] as const;
