import { defineConfig } from 'vite';

// The console is served by the API under `/`; relative asset paths keep it working under any prefix.
export default defineConfig({
  root: import.meta.dirname,
  base: './',
  logLevel: 'warn',
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    target: 'es2022',
    sourcemap: true,
    chunkSizeWarningLimit: 400,
  },
});
