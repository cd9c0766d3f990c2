import express, { type Express } from 'express';
import { existsSync } from 'node:fs';
import { join } from 'node:path';

// Angular's production build names bundles name-HASH.ext, with an 8-character upper-case hash (Angular CLI output)
const hashedAsset = /-[A-Z0-9]{8,}\.(?:js|mjs|css|woff2?|ttf|svg|png|jpg|webp|avif|ico|map)$/;
// one year, immutable: the usual lifetime for content-hashed assets (RFC 8246 for immutable)
const hashedAssetCache = 'public, max-age=31536000, immutable';

/**
 * Serves the built web app from `root` (if index.html is there): hashed assets cached for a year, everything else
 * revalidated, and index.html for any other GET outside /api so client-side routes load.
 */
export function serveWebApp(app: Express, root: string): boolean {
  const index = join(root, 'index.html');
  if (!existsSync(index)) return false;
  app.use(
    express.static(root, {
      index: false,
      setHeaders(res, file) {
        res.setHeader('Cache-Control', hashedAsset.test(file) ? hashedAssetCache : 'no-cache');
      },
    }),
  );
  app.use((req, res, next) => {
    if (
      (req.method !== 'GET' && req.method !== 'HEAD') ||
      req.path === '/api' ||
      req.path.startsWith('/api/')
    ) {
      return next();
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
  return true;
}
