/**
 * Builds the renderer (app/renderer) into dist/renderer: the same files the desktop window loads and
 * the browser mode serves. Relative asset paths, so both the app:// protocol and http:// work.
 */
import { fileURLToPath } from 'node:url';
import { svelte } from '@sveltejs/vite-plugin-svelte';
import { defineConfig } from 'vite';

const here = (p: string) => fileURLToPath(new URL(p, import.meta.url));

export default defineConfig({
  root: here('./app/renderer'),
  base: './',
  publicDir: false,
  plugins: [svelte({ configFile: here('./svelte.config.js') })],
  build: {
    outDir: here('./dist/renderer'),
    emptyOutDir: true,
    target: 'es2022',
    sourcemap: true,
    // chart.js with its zoom plugin is one chunk of about 250 kB; that is fine for a local app.
    chunkSizeWarningLimit: 800,
    modulePreload: { polyfill: false },
  },
  server: { host: '127.0.0.1', strictPort: false },
});
