/**
 * Builds the ops console (console/src) into console/dist, served by the API under /console/.
 * `npm run console:build`. The console imports only contract/ of the project, so the browser validates with
 * the same zod problem schema as the API and bundles no numerics (test/e2e/bundle-contents.test.ts checks).
 */
import { builtinModules } from 'node:module';
import { fileURLToPath } from 'node:url';
import { defineConfig, type Plugin } from 'vite';

const here = fileURLToPath(new URL('.', import.meta.url));

/** Fails the build when browser code reaches a Node built-in (Vite would otherwise only warn and stub it). */
function noNodeBuiltins(): Plugin {
  const builtins = new Set(builtinModules);
  return {
    name: 'veer-no-node-builtins',
    enforce: 'pre',
    resolveId(id, importer) {
      if (id.startsWith('node:') || builtins.has(id)) {
        this.error(`browser bundle imports the Node module "${id}" (from ${importer ?? '?'}); import a module file that does not need it`);
      }
      return null;
    },
  };
}

export default defineConfig({
  plugins: [noNodeBuiltins()],
  root: here,
  base: '/console/',
  publicDir: false,
  logLevel: 'warn',
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    target: 'es2022',
    sourcemap: true,
    reportCompressedSize: false,
    chunkSizeWarningLimit: 800,
  },
});
