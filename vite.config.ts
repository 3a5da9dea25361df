import { defineConfig, type Plugin } from 'vite';
import react from '@vitejs/plugin-react';

/**
 * The built app must not be able to send data anywhere. The policy is sent as a header by
 * `vite preview` (a <meta> policy does not govern a worker loaded from a URL) and also sits in
 * index.html for static hosts. The dev server needs ws: for hot reload, so it is not enforced there.
 */
export const CONTENT_SECURITY_POLICY =
  "default-src 'none'; script-src 'self' 'wasm-unsafe-eval'; style-src 'self' 'unsafe-inline'; img-src 'self' data: blob:; " +
  "font-src 'self'; connect-src 'none'; worker-src 'self' blob:; form-action 'none'; base-uri 'none'; " +
  "object-src 'none'; frame-ancestors 'none'";

/** The dev server's hot reload talks over a WebSocket; allow that in `npm start` only, never in the build. */
function allowHotReloadInDev(): Plugin {
  return {
    name: 'levelwise-dev-csp',
    apply: 'serve',
    transformIndexHtml: (html) => html.replace("connect-src 'none'", "connect-src 'self' ws: wss:"),
  };
}

export default defineConfig({
  plugins: [react(), allowHotReloadInDev()],
  worker: { format: 'es' },
  preview: {
    headers: { 'Content-Security-Policy': CONTENT_SECURITY_POLICY },
  },
  // zod comes with the recipe checks; one chunk of ~550 KB is fine for an app that works offline.
  build: { target: 'es2022', sourcemap: false, chunkSizeWarningLimit: 800 },
});
