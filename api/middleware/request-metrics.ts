import type { RequestHandler } from 'express';
import type { Metrics } from '../metrics/metrics.js';
import { routeOf } from './metering.js';
import { whenAnswered } from './answered.js';

interface MeteredLocals {
  routePattern?: string;
  limitedBy?: string;
  quotaTicket?: { units: number };
}

/**
 * Counts every answer for /metrics: route pattern (the policy table's, so the labels stay few),
 * status and latency; calls a limit refused; quota units used. Label values never carry ids or
 * query strings. Unmatched paths share one label per method.
 */
export function requestMetrics(metrics: Metrics): RequestHandler {
  return (req, res, next) => {
    const started = performance.now();
    whenAnswered(res, () => {
      const l = res.locals as MeteredLocals;
      const route = l.routePattern ? routeOf(req, res) : req.path === '/metrics' ? 'GET /metrics' : `${req.method} (unmatched)`;
      const status = res.headersSent ? res.statusCode : 499; // 499: the client went away before an answer
      metrics.httpRequests.inc({ route, status: String(status) });
      metrics.httpDuration.observe({ route, status_class: `${Math.floor(status / 100)}xx` }, (performance.now() - started) / 1000);
      if (l.limitedBy) metrics.refusals.inc({ reason: l.limitedBy });
      else if (l.quotaTicket) metrics.quotaUnits.inc(l.quotaTicket.units);
    });
    next();
  };
}

