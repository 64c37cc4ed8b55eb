import type { Express } from 'express';

interface Layer {
  route?: { path: string | string[]; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
  rawPath?: string;
}

/**
 * Walks Express 5's router stack and lists every mounted `METHOD /path`, with Express params
 * (`:id`) written as OpenAPI templates (`{id}`), so tests can compare with the document.
 */
export function mountedRoutes(app: Express): string[] {
  const out: string[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
        for (const p of paths) {
          for (const [method, on] of Object.entries(layer.route.methods)) {
            if (!on || method === '_all') continue;
            const full = `${prefix}${p === '/' ? '' : p}` || '/';
            out.push(`${method.toUpperCase()} ${full.replace(/:(\w+)/g, '{$1}')}`);
          }
        }
      } else if (layer.handle?.stack) {
        const mount = typeof layer.rawPath === 'string' && layer.rawPath !== '/' ? layer.rawPath : '';
        walk(layer.handle.stack, prefix + mount);
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  return [...new Set(out)].sort();
}
