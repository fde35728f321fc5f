import { fileURLToPath } from 'node:url';
import tailwindcss from '@tailwindcss/vite';
import react from '@vitejs/plugin-react';
import { defineConfig } from 'vite';

const root = fileURLToPath(new URL('.', import.meta.url));

// The client is built into dist/, which `osmia serve` hands to createApp as clientDist. `#shared/*`
// resolves through package.json "imports" (Vite follows Node's subpath imports), so no alias here.
export default defineConfig({
  root,
  plugins: [react(), tailwindcss()],
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    sourcemap: false,
  },
  server: {
    host: '127.0.0.1',
    port: 5173,
    strictPort: true,
    // The API runs beside the dev server (`osmia serve`, port 3000): same-origin cookies keep working.
    proxy: { '/api': { target: 'http://127.0.0.1:3000', changeOrigin: false } },
  },
  preview: { host: '127.0.0.1' },
});
