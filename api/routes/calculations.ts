import { Router } from 'express';
import { cableRequestSchema, cableResponseSchema } from '../../shared/schemas/cable.js';
import { driverRequestSchema, driverResponseSchema } from '../../shared/schemas/driver.js';
import { pixelsRequestSchema, pixelsResponseSchema } from '../../shared/schemas/pixels.js';
import { reelsRequestSchema, reelsResponseSchema } from '../../shared/schemas/reels.js';
import { voltageDropRequestSchema, voltageDropResponseSchema } from '../../shared/schemas/voltage-drop.js';
import { chooseCable } from '../../shared/sizing/cable.js';
import { chooseDrivers } from '../../shared/sizing/drivers.js';
import { pixelData } from '../../shared/sizing/pixels.js';
import { planReels } from '../../shared/sizing/reels.js';
import { voltageDrop } from '../../shared/sizing/voltage-drop.js';
import { defineCalculation, documentCalculation, mountCalculation } from './calculation-route.js';
import { reelsCost } from './sizing-costs.js';
import { costBudget } from '../middleware/cost-budget.js';
import type { RouteModule } from './route-module.js';

const BASE = '/v1/calculations';

const calculations = [
  defineCalculation({
    path: `${BASE}/voltage-drop`,
    operationId: 'calculateVoltageDrop',
    summary: 'Voltage drop on a two-wire DC run',
    description:
      'Drop along the loop (out and back) of a low-voltage run, Vd = 2·L·I·R′ (IEC 60364-5-52 Annex G, cos φ = 1), ' +
      'with the load at the far end or spread evenly along the run (half the drop). R′ comes from the chosen ' +
      'conductor table, corrected to `temperatureC` (IEC 60028, 0.00393 /K). No standard sets a drop limit for ' +
      'LED strip: the default is 5 % and configurable.',
    request: voltageDropRequestSchema,
    response: voltageDropResponseSchema,
    compute: voltageDrop,
  }),
  defineCalculation({
    path: `${BASE}/cable`,
    operationId: 'calculateCable',
    summary: 'Smallest cable for a run',
    description:
      'The smallest standard size of the conductor table that keeps the drop within `maxDropPercent` and carries ' +
      'the current (the cord’s current rating), never below `minCrossSectionMm2` (0.5 mm² by default). Every ' +
      'size is listed under `alternatives`. A run over 10 m is flagged (common practice).',
    request: cableRequestSchema,
    response: cableResponseSchema,
    compute: chooseCable,
  }),
  defineCalculation({
    path: `${BASE}/driver`,
    operationId: 'calculateDriver',
    summary: 'LED drivers for a load',
    description:
      'Required rating = load / loading limit (80 % by default, common practice; the NEC 125 % continuous-load rule ' +
      'is the same figure). Chooses from the available ratings the fewest drivers, then the least total rating, ' +
      'then the fewest distinct ratings. `class2: true` caps each supply by the NEC Chapter 9 Table 11 rule for its ' +
      'voltage. Mains-side input power and current when an efficiency is given — mains wiring is work for a licensed electrician.',
    request: driverRequestSchema,
    response: driverResponseSchema,
    compute: chooseDrivers,
  }),
  defineCalculation({
    path: `${BASE}/pixels`,
    operationId: 'calculatePixels',
    summary: 'Pixel data timing, outputs and power',
    description:
      'Frame time and refresh rate of an addressable run: one-wire NRZ (24 or 32 bits per pixel at 800 or 400 kbit/s ' +
      'plus the latch time) or clocked data + clock (start frame, 32 bits per pixel, end frame). Data outputs needed ' +
      'for the per-output limit, and full-white current and power at the brightness cap.',
    request: pixelsRequestSchema,
    response: pixelsResponseSchema,
    compute: pixelData,
  }),
  defineCalculation({
    path: `${BASE}/reels`,
    operationId: 'calculateReels',
    summary: 'Cutting tread pieces from reels',
    description:
      'Cuts the pieces from reels (5 m by default) without a joint inside any piece — a one-dimensional cutting-stock ' +
      'problem. Exact search up to 12 pieces, first-fit decreasing beyond, with the lower bound reported.',
    request: reelsRequestSchema,
    response: reelsResponseSchema,
    compute: planReels,
    cost: reelsCost,
  }),
];

export const calculationRoutes: RouteModule = {
  basePath: BASE,
  router(deps, services) {
    const router = Router();
    const charge = costBudget(services, deps.logger);
    for (const calc of calculations) mountCalculation(router, BASE, calc, charge, services.metrics.timeEngine);
    return router;
  },
  docs(registry) {
    for (const calc of calculations) documentCalculation(registry, calc);
  },
};
