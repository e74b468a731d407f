// Vite builds the Beadroll web app to apps/web/dist, which the API serves at the same origin.
// In development `vite` proxies /api to the API on $PORT so cookies stay first-party.
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { compression, defineAlgorithm } from 'vite-plugin-compression2';
import { constants } from 'node:zlib';
import { fileURLToPath } from 'node:url';

const apiPort = process.env.PORT ?? '8080';

export default defineConfig({
  plugins: [
    react(),
    tailwindcss(),
    // Brotli and gzip copies of every text asset, made once here; the API sends them as they are.
    compression({
      include: /\.(js|css|svg|html|json|txt)$/,
      threshold: 512,
      algorithms: [
        defineAlgorithm('brotliCompress', { params: { [constants.BROTLI_PARAM_QUALITY]: 11 } }),
        defineAlgorithm('gzip', { level: 9 }),
      ],
    }),
  ],
  root: fileURLToPath(new URL('.', import.meta.url)),
  resolve: { alias: { '@': fileURLToPath(new URL('./src', import.meta.url)) } },
  server: {
    host: '127.0.0.1',
    port: 5173,
    proxy: { '/api': { target: `http://127.0.0.1:${apiPort}`, changeOrigin: false } },
  },
  preview: { host: '127.0.0.1' },
  build: {
    outDir: fileURLToPath(new URL('./dist', import.meta.url)),
    emptyOutDir: true,
    sourcemap: false,
    // The bundle budget test reads the manifest to add up what each screen loads before it paints.
    manifest: true,
    modulePreload: { polyfill: false },
    rolldownOptions: {
      output: {
        codeSplitting: {
          groups: [
            // What every screen runs: one file compresses better than many small ones.
            {
              name: 'framework',
              test: /node_modules[\\/](react|react-dom|scheduler|react-router|react-router-dom|@tanstack[\\/](query-core|react-query)|zod)[\\/]/,
            },
          ],
        },
      },
    },
  },
});
