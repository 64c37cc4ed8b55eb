import compression from 'compression';
import { Router, type RequestHandler, type Response } from 'express';
import { z } from 'zod';
import { EMBED_BASE_PATH, EMBED_MANIFEST_FILE, EMBED_SCRIPT_FILE, readEmbedBundle, type EmbedBundle } from '../embed/bundle.js';
import { problemResponse } from '../openapi/document.js';
import { problems } from '../problem.js';
import type { RouteModule } from './route-module.js';

/** The moving name is re-checked within minutes of a release; the versioned copy never changes. */
const MOVING_CACHE = 'public, max-age=300, must-revalidate';
const IMMUTABLE_CACHE = 'public, max-age=31536000, immutable';
/** What `npm run build:embed` names a version: the release and a content hash. */
const VERSION_PATTERN = /^[0-9A-Za-z.+-]{1,64}$/;

/**
 * Shops load the script from their own pages: helmet's same-origin resource policy would block
 * it, and an SRI-checked script is fetched in CORS mode, so these answers alone are open to all.
 */
const openToShops: RequestHandler = (_req, res, next) => {
  res.setHeader('Cross-Origin-Resource-Policy', 'cross-origin');
  res.setHeader('Access-Control-Allow-Origin', '*');
  next();
};

const manifestSchema = z
  .object({
    version: z.string().meta({ description: 'Release and content hash of the script; each build is a new version.', example: '0.1.0-28e3e4ccde33' }),
    integrity: z.string().meta({ description: 'Subresource integrity of the versioned script, for the `integrity` attribute.', example: 'sha384-B5dgiQRTbVn2yAinlJpz2THXWPKmops6VfXGUy2MYYtchPzRfCwRJ1R7bGGcbmXI' }),
    url: z.string().meta({ description: 'Path of the immutable versioned copy on this API.', example: '/embed/v1/0.1.0-28e3e4ccde33/treadwise-estimator.js' }),
    bytes: z.int().meta({ description: 'Size of the script, bytes.' }),
    gzipBytes: z.int().meta({ description: 'Size gzipped, bytes (the budget is 120 kB).' }),
  })
  .meta({ id: 'EmbedManifest', description: 'The current `<treadwise-estimator>` script: where its immutable copy is and its SRI hash.' });

export const embedScriptRoutes: RouteModule = {
  basePath: EMBED_BASE_PATH,

  router({ config }, services) {
    // Read once: the script changes only with a new build, which is a new start.
    const bundle: EmbedBundle | undefined = readEmbedBundle(config.embedDir);
    if (bundle) void services.embedScripts.remember(bundle);
    const built = (): EmbedBundle => {
      if (!bundle) throw problems.notFound('The estimator script is not built on this server (npm run build:embed).');
      return bundle;
    };
    const sendScript = (res: Response, version: string, script: Buffer, cacheControl: string) => {
      res.setHeader('Cache-Control', cacheControl);
      res.setHeader('ETag', `"${version}"`);
      res.type('text/javascript; charset=utf-8');
      res.send(script); // answers 304 to a matching If-None-Match
    };

    const router = Router();
    router.use(openToShops, compression());
    router.get(`/${EMBED_SCRIPT_FILE}`, (_req, res) => {
      const b = built();
      sendScript(res, b.manifest.version, b.script, MOVING_CACHE);
    });
    router.get(`/:version/${EMBED_SCRIPT_FILE}`, async (req, res) => {
      const { version } = req.params;
      if (bundle && version === bundle.manifest.version) return sendScript(res, version, bundle.script, IMMUTABLE_CACHE);
      // An earlier release's script, as this deployment first served it.
      const script = VERSION_PATTERN.test(version) ? await services.embedScripts.find(version) : undefined;
      if (!script) {
        const current = bundle ? `; the current one is ${bundle.manifest.version}` : '';
        throw problems.notFound(`No estimator script of version ${version.slice(0, 64)} here${current}.`);
      }
      sendScript(res, version, script, IMMUTABLE_CACHE);
    });
    router.get(`/${EMBED_MANIFEST_FILE}`, (_req, res) => {
      const { version, integrity, url, bytes, gzipBytes } = built().manifest;
      res.setHeader('Cache-Control', 'no-cache');
      res.json({ version, integrity, url, bytes, gzipBytes });
    });
    router.use(() => {
      throw problems.notFound();
    });
    return router;
  },

  docs(registry) {
    const script = { 'text/javascript': { schema: z.string().meta({ description: 'The script (an IIFE).' }) } };
    const notBuilt = problemResponse('The script is not built on this server, or (versioned) not of that version.');
    const cors = {
      'Access-Control-Allow-Origin': { description: '`*`: shops load the script with SRI, which fetches in CORS mode.', schema: { type: 'string' as const } },
      'Cross-Origin-Resource-Policy': { description: '`cross-origin`: shops’ pages may load it.', schema: { type: 'string' as const } },
    };
    registry.registerPath({
      method: 'get',
      path: `${EMBED_BASE_PATH}/${EMBED_SCRIPT_FILE}`,
      tags: ['Embed'],
      operationId: 'getEmbedScript',
      security: [], // public: shops' pages load it without credentials
      summary: 'The estimator element script (latest)',
      description: 'Defines `<treadwise-estimator>`. Cached for 5 minutes; pin a version with the immutable copy and its SRI hash from the manifest.',
      responses: { 200: { description: 'The script.', headers: cors, content: script }, 404: notBuilt },
    });
    registry.registerPath({
      method: 'get',
      path: `${EMBED_BASE_PATH}/{version}/${EMBED_SCRIPT_FILE}`,
      tags: ['Embed'],
      operationId: 'getEmbedScriptVersion',
      security: [],
      summary: 'The estimator element script (one version, immutable)',
      description: 'The same script under its version: cached for a year, never changed, and still served after later releases. Load it with the `integrity` of the manifest.',
      request: { params: z.object({ version: z.string().min(1).max(64).meta({ description: 'The version from the manifest.', example: '0.1.0-28e3e4ccde33' }) }) },
      responses: { 200: { description: 'The script.', headers: cors, content: script }, 404: notBuilt },
    });
    registry.registerPath({
      method: 'get',
      path: `${EMBED_BASE_PATH}/${EMBED_MANIFEST_FILE}`,
      tags: ['Embed'],
      operationId: 'getEmbedManifest',
      security: [],
      summary: 'Version and SRI hash of the estimator script',
      description: 'The current version of `<treadwise-estimator>`, the path of its immutable copy and its subresource-integrity hash: what a shop pastes into its script tag.',
      responses: { 200: { description: 'The manifest.', headers: cors, content: { 'application/json': { schema: manifestSchema } } }, 404: notBuilt },
    });
  },
};
