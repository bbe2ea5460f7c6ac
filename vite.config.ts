import { defineConfig, type Plugin } from 'vitest/config';
import react from '@vitejs/plugin-react';

/**
 * Content-Security-Policy of the built app: scripts and workers only from our own origin (no
 * inline script, no eval), no requests to any other host. Styles allow 'unsafe-inline' because
 * plotly writes <style> rules and style attributes at run time. Only for the build: the dev
 * server's hot-reload client needs inline scripts and a websocket.
 */
const CONTENT_SECURITY_POLICY = [
  "default-src 'self'",
  "script-src 'self'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self' data:",
  "connect-src 'self'",
  "worker-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
].join('; ');

function contentSecurityPolicy(): Plugin {
  return {
    name: 'ladder-bench-csp',
    apply: 'build',
    transformIndexHtml: {
      order: 'post',
      // Right after the charset declaration, before any script or style.
      handler: (html) =>
        html.replace(
          /(<meta charset="[^"]*"\s*\/?>)/i,
          `$1\n    <meta http-equiv="Content-Security-Policy" content="${CONTENT_SECURITY_POLICY}" />`,
        ),
    },
  };
}

/**
 * plotly's registry has a static require of the map library's stylesheet, run only when a map
 * trace is registered; our partial plotly bundle (src/ui/plotlyBundle.ts) registers none, so the
 * 80 kB stylesheet is replaced by nothing instead of being shipped.
 */
function unusedMapStyles(): Plugin {
  const id = '\0ladder-bench-no-map-css';
  return {
    name: 'ladder-bench-no-map-css',
    enforce: 'pre',
    resolveId: (source) => (source === 'maplibre-gl/dist/maplibre-gl.css' ? id : null),
    load: (source) => (source === id ? '' : null),
  };
}

export default defineConfig({
  plugins: [react(), contentSecurityPolicy(), unusedMapStyles()],
  // Some of plotly's dependencies read Node's `global`; in the browser that is globalThis.
  define: { global: 'globalThis' },
  worker: { format: 'es' },
  build: { target: 'es2022', chunkSizeWarningLimit: 4000 },
  test: {
    include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
    exclude: ['test/browser/**', 'node_modules/**'],
    environment: 'node',
    testTimeout: 30000,
  },
});
