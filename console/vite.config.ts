/**
 * Builds the ops console (console/src) into console/dist, served by the API under /console/.
 * `npm run console:build`. The planner's problem schema is bundled from its module file so the browser
 * validates with the same zod definition as the API.
 */
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';

const here = fileURLToPath(new URL('.', import.meta.url));

export default defineConfig({
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
