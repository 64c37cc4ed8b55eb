import type { EstimateBatchItemResult } from '../../schemas/estimate-batch.js';

/**
 * The flat result row of one stair, for CSV results of batch jobs and `treadwise batch`: the row
 * number (1 = first stair of the input, header not counted), the stair's reference, its status,
 * the headline figures, the ids of failing and warning checks (`;`-separated), `bomTotal`, and
 * for a refused row the problem with its field errors. Documented in docs/batch-rows.md.
 */
export const BATCH_RESULT_COLUMNS = [
  'row',
  'ref',
  'status',
  'layout',
  'treads',
  'litTreads',
  'controllers',
  'totalLoadW',
  'driverCount',
  'longestRunM',
  'longestFeederM',
  'worstDropPercent',
  'motionSensors',
  'reels',
  'checksPass',
  'checksWarn',
  'checksFail',
  'failingChecks',
  'warningChecks',
  'bomTotal',
  'currency',
  'problemCode',
  'problemDetail',
  'problemErrors',
] as const;

export type BatchResultColumn = (typeof BATCH_RESULT_COLUMNS)[number];
export type BatchResultCell = string | number | null;

/** One item as its CSV cells, in BATCH_RESULT_COLUMNS order; absent values are null (an empty cell). */
export function batchResultRow(item: EstimateBatchItemResult): BatchResultCell[] {
  const cells: Record<BatchResultColumn, BatchResultCell> = {
    row: item.index + 1,
    ref: item.ref,
    status: item.status,
    layout: null,
    treads: null,
    litTreads: null,
    controllers: null,
    totalLoadW: null,
    driverCount: null,
    longestRunM: null,
    longestFeederM: null,
    worstDropPercent: null,
    motionSensors: null,
    reels: null,
    checksPass: null,
    checksWarn: null,
    checksFail: null,
    failingChecks: null,
    warningChecks: null,
    bomTotal: null,
    currency: null,
    problemCode: null,
    problemDetail: null,
    problemErrors: null,
  };
  if (item.status === 'ok') {
    const s = item.summary;
    Object.assign(cells, {
      layout: item.layout,
      treads: s.treads,
      litTreads: s.litTreads,
      controllers: s.controllers,
      totalLoadW: s.totalLoadW,
      driverCount: s.driverCount,
      longestRunM: s.longestRunM,
      longestFeederM: s.longestFeederM ?? null,
      worstDropPercent: s.worstDropPercent,
      motionSensors: s.motionSensors,
      reels: s.reels,
      checksPass: s.checks.pass,
      checksWarn: s.checks.warn,
      checksFail: s.checks.fail,
      failingChecks: item.failingChecks.join(';'),
      warningChecks: item.warningChecks.join(';'),
      bomTotal: item.bomTotal ?? null,
      currency: item.currency ?? null,
    });
  } else {
    cells.problemCode = item.problem.code;
    cells.problemDetail = item.problem.detail;
    cells.problemErrors = item.problem.errors?.map((e) => `${e.path}: ${e.message}`).join('; ') ?? null;
  }
  return BATCH_RESULT_COLUMNS.map((column) => cells[column]);
}
