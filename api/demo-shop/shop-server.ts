import { randomBytes } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import express from 'express';
import { renderShopPage, shopPagePolicy, type ShopPageConfig } from './shop-page.js';

export interface DemoShop {
  /** The shop's address as a person types it. */
  url: string;
  /** The origins the shop is reached from on this machine (for the demo key's allow-list). */
  origins: string[];
  /** Hands the page what it needs once the API listens. */
  configure(config: ShopPageConfig): void;
  close(): Promise<void>;
}

/**
 * The invented Harbor Lane shop on a port of its own, so it is another origin than the API, as
 * a real shop's page is. Listens before the API starts so the demo seed knows its origins.
 */
export async function startDemoShop(options: { dir: string; host: string; port: number }): Promise<DemoShop | undefined> {
  const dir = path.resolve(options.dir);
  const templateFile = path.join(dir, 'index.html');
  if (!existsSync(templateFile)) return undefined;
  const template = readFileSync(templateFile, 'utf8');
  let config: ShopPageConfig | undefined;

  const app = express();
  app.disable('x-powered-by');
  app.use((_req, res, next) => {
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.setHeader('Referrer-Policy', 'no-referrer');
    next();
  });
  app.get(['/', '/index.html'], (_req, res) => {
    if (!config) return void res.status(503).type('text/plain').send('The shop is opening; try again in a moment.');
    const nonce = randomBytes(16).toString('base64');
    res.setHeader('Content-Security-Policy', shopPagePolicy(config.apiOrigin, nonce));
    res.setHeader('Cache-Control', 'no-store');
    res.type('html').send(renderShopPage(template, config, nonce));
  });
  app.use(express.static(dir, { index: false, maxAge: 0 }));

  const server: Server = createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port, options.host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const { port } = server.address() as AddressInfo;
  const shown = options.host === '0.0.0.0' || options.host === '::' ? 'localhost' : options.host;
  return {
    url: `http://${shown}:${port}`,
    origins: [`http://localhost:${port}`, `http://127.0.0.1:${port}`],
    configure(next) {
      config = next;
    },
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
