import { minorUnitDigits, type Catalog } from '../../schemas/catalog.js';
import type { EstimateResult } from '../../schemas/estimate.js';
import type { KitDesign, KitOptionsInput, KitOptionsResult } from '../../schemas/estimate-options.js';
import { DEFAULT_OPTION_DESIGNS, MAX_OPTION_CANDIDATES } from '../../tables/option-limits.js';
import { estimate } from '../estimate/estimate.js';
import { ENGINE_VERSION } from '../version.js';
import { planCandidates, type Candidate } from './candidates.js';
import { priceOf, type KitPrice, type PricingSource } from './pricing.js';
import { compareDesigns, RANKED_BY, type Rankable } from './rank.js';

export { planCandidates } from './candidates.js';
export { compareDesigns, RANKED_BY } from './rank.js';

interface Passing extends Rankable {
  candidate: Candidate;
  result: EstimateResult;
  price: KitPrice;
}

/**
 * POST /v1/estimates/options: size every candidate kit of the catalog as a full estimate, keep
 * those with no failing check within the budget, and answer the cheapest `limit` of them.
 * Pure and deterministic, as the engine: the catalog (inline or the organisation's active items)
 * is passed in. A search larger than MAX_OPTION_CANDIDATES sizes the cheapest parts first and says so.
 */
export function rankKitOptions(input: KitOptionsInput, catalog: Catalog, source: PricingSource): KitOptionsResult {
  const plan = planCandidates(input, catalog);
  const scale = 10 ** minorUnitDigits(catalog.currency);
  const basis = input.budget?.basis ?? 'gross';
  const capMinor = input.budget ? Math.round(input.budget.maxTotal * scale) : null;

  const passing: Passing[] = [];
  const failuresByCheck: Record<string, number> = {};
  let failed = 0;
  let overBudget = 0;
  for (const candidate of plan.candidates) {
    const result = estimate(candidate.input);
    const failing = new Set(result.checks.filter((c) => c.status === 'fail').map((c) => c.id));
    if (failing.size > 0) {
      failed++;
      for (const id of failing) failuresByCheck[id] = (failuresByCheck[id] ?? 0) + 1;
      continue;
    }
    const price = priceOf(result, catalog, source);
    if (capMinor !== null && (basis === 'gross' ? price.grossMinor : price.netMinor) > capMinor) {
      overBudget++;
      continue;
    }
    passing.push({
      candidate,
      result,
      price,
      fillable: price.fillable,
      netMinor: price.netMinor,
      unpricedLines: price.unpriced.length,
      warnings: result.summary.checks.warn,
      choices: candidate.choices,
    });
  }
  passing.sort(compareDesigns);
  const listed = passing.slice(0, input.limit ?? DEFAULT_OPTION_DESIGNS);
  const designs = listed.map((p, i) => designOf(p, i + 1));
  // Every listed kit is wired to mains and drivers: their cautions travel with the answer, each once.
  const cautions = new Map<string, EstimateResult['cautions'][number]>();
  for (const p of listed) for (const c of p.result.cautions) if (!cautions.has(c.code)) cautions.set(c.code, c);

  return {
    engineVersion: ENGINE_VERSION,
    layout: 'tread-strips',
    currency: catalog.currency,
    rankedBy: RANKED_BY,
    designs,
    possible: plan.possible,
    candidates: plan.candidates.length,
    capped: plan.capped,
    passed: passing.length,
    failed,
    overBudget,
    failuresByCheck: Object.fromEntries(Object.entries(failuresByCheck).sort((a, b) => (a[0] < b[0] ? -1 : 1))),
    pruned: plan.pruned,
    cautions: [...cautions.values()],
    pricingSource: source.source,
    catalogVersion: source.catalogVersion,
    trace: [
      {
        quantity: 'possible',
        value: plan.possible,
        unit: 'candidates',
        formula: 'strips × controllers × controller positions × driver positions (after constraints and pruning)',
        inputs: {
          strips: new Set(plan.candidates.map((c) => c.choices.stripSku)).size,
          controllers: new Set(plan.candidates.map((c) => c.choices.controllerSku)).size,
          pruned: plan.pruned.length,
          cap: MAX_OPTION_CANDIDATES,
        },
        reference: 'arithmetic',
      },
      {
        quantity: 'passed',
        value: passing.length,
        unit: 'candidates',
        formula: 'candidates − failed − overBudget',
        inputs: { candidates: plan.candidates.length, failed, overBudget, budget: input.budget ? input.budget.maxTotal : null, basis },
        reference: 'each candidate sized by the estimate engine; a design passes when no check fails',
      },
    ],
  };
}

function designOf(p: Passing, rank: number): KitDesign {
  const { catalog: _catalog, ...estimateRequest } = p.candidate.input;
  return {
    rank,
    choices: p.candidate.choices,
    pricing: p.price.pricing,
    summary: p.result.summary,
    cart: p.price.cart,
    fillable: p.price.fillable,
    unpriced: p.price.unpriced,
    warnings: p.result.checks
      .filter((c) => c.status === 'warn')
      .map((c) => (c.suggestion === undefined ? { id: c.id, message: c.message } : { id: c.id, message: c.message, suggestion: c.suggestion })),
    estimateRequest,
  };
}
