/**
 * What an export knows beyond the estimate itself: where it was stored and for whom. Every field
 * is optional, so each renderer works on any EstimateResult (a stored one or one just computed).
 */
export interface ExportContext {
  estimateId?: string;
  /** When the estimate was run; also the PDF's creation date, so the same estimate renders alike. */
  createdAt?: Date | string;
  projectName?: string;
  clientName?: string;
  siteAddress?: string;
  stairName?: string;
  /** Who ran the estimate (a name or e-mail). */
  ranBy?: string;
  /**
   * Treads of each flight, foot first (the request's `staircase.flights[].treads`). The answer
   * itself does not say where one flight ends; without this, the flight column is filled only for
   * a stair the answer shows to be a single flight.
   */
  treadsPerFlight?: readonly number[];
}

/** The context's date as ISO 8601 (UTC), or undefined when none or not a date. */
export function createdAtIso(context: ExportContext): string | undefined {
  if (context.createdAt === undefined) return undefined;
  const date = context.createdAt instanceof Date ? context.createdAt : new Date(context.createdAt);
  return Number.isNaN(date.getTime()) ? undefined : date.toISOString();
}

/** Context fields as labelled lines, in the order a hand-over reads them. */
export function contextLines(context: ExportContext): [label: string, value: string][] {
  const lines: [string, string | undefined][] = [
    ['client', context.clientName],
    ['site', context.siteAddress],
    ['project', context.projectName],
    ['stair', context.stairName],
    ['estimate', context.estimateId],
    ['run at', createdAtIso(context)],
    ['run by', context.ranBy],
  ];
  return lines.filter((l): l is [string, string] => l[1] !== undefined && l[1] !== '');
}
