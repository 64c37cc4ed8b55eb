import type { Request } from 'express';
import { ipKeyGenerator } from 'express-rate-limit';

/**
 * The client's address as limits and lockouts key it: IPv4 as is, IPv6 by its /56 network, so
 * one host cannot step round a limit by walking its own IPv6 prefix. Behind a proxy it needs
 * TRUST_PROXY to see the client rather than the proxy.
 */
export function clientAddress(req: Request): string {
  return ipKeyGenerator(req.ip ?? '');
}
