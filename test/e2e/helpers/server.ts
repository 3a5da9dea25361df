/**
 * Builds the app once per test file and serves it with `vite preview` on a free localhost port,
 * so the e2e tests see the production bundle with the production headers (CSP).
 */
import { createServer } from 'node:net';
import { join, resolve } from 'node:path';
import { build, preview, type PreviewServer } from 'vite';

export const ROOT = join(import.meta.dirname, '../../..');
export const RESULTS = join(ROOT, 'test-results');

export interface ServedApp {
  readonly url: string;
  close(): Promise<void>;
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.unref();
    server.on('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address !== null ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

/**
 * `outDirName` (under test-results/, or an absolute path) keeps parallel builds apart.
 * `contentSecurityPolicy`: sent instead of the production policy (vite.config.ts), as a host might.
 */
export async function buildAndServe(outDirName: string, options: { contentSecurityPolicy?: string } = {}): Promise<ServedApp> {
  const outDir = resolve(RESULTS, outDirName);
  await build({ root: ROOT, logLevel: 'warn', build: { outDir, emptyOutDir: true } });
  const port = await freePort();
  const headers = options.contentSecurityPolicy === undefined ? {} : { headers: { 'Content-Security-Policy': options.contentSecurityPolicy } };
  const server: PreviewServer = await preview({
    root: ROOT,
    logLevel: 'warn',
    build: { outDir },
    preview: { host: '127.0.0.1', port, strictPort: true, open: false, ...headers },
  });
  return {
    url: `http://127.0.0.1:${port}/`,
    close: () => server.close(),
  };
}
