/// <reference types="vitest/config" />
import { fileURLToPath, URL } from 'node:url';
import tailwindcss from '@tailwindcss/vite';
import react from '@vitejs/plugin-react';
import { defineConfig, type Connect, type Plugin } from 'vite';

const page = (name: string) => fileURLToPath(new URL(`./${name}`, import.meta.url));

/**
 * The owner's e-mailed link, /decide/<token>, opens decide.html: the decision page's own light
 * entry. The built app's server does the same; this does it for `vite` and `vite preview`.
 */
function decideEntry(): Plugin {
  const rewrite: Connect.NextHandleFunction = (req, _res, next) => {
    if (req.method === 'GET' && req.url && /^\/decide\/[^/?#]*\/?(?:[?#].*)?$/.test(req.url)) req.url = '/decide.html';
    next();
  };
  return {
    name: 'wingstage-decide-entry',
    configureServer: (server) => void server.middlewares.use(rewrite),
    configurePreviewServer: (server) => void server.middlewares.use(rewrite),
  };
}

/**
 * `vite build --ssr` (docker-free-scripts/build-client.sh): the decision page's first view as a
 * function the server calls (src/decide-ssr.tsx), one self-contained file in client/dist-ssr, loaded
 * by the server by path. Everything is bundled in, so it needs nothing from client/node_modules.
 */
const ssrBuild = {
  outDir: 'dist-ssr',
  emptyOutDir: true,
  ssr: 'src/decide-ssr.tsx',
  copyPublicDir: false,
  minify: true,
  rolldownOptions: { output: { entryFileNames: 'decide-ssr.js' } },
};

export default defineConfig(({ isSsrBuild }) => ({
  ssr: isSsrBuild ? { noExternal: true } : undefined,
  plugins: [react(), tailwindcss(), decideEntry()],
  resolve: {
    alias: { '@': fileURLToPath(new URL('./src', import.meta.url)) },
  },
  server: {
    host: '127.0.0.1',
    port: 5173,
    proxy: { '/api': 'http://127.0.0.1:3000' },
  },
  build: isSsrBuild ? ssrBuild : {
    outDir: 'dist',
    emptyOutDir: true,
    // Two pages: the app, and the owner's decision page with only what it needs.
    rolldownOptions: {
      input: { main: page('index.html'), decide: page('decide.html') },
      output: {
        // Few, larger files: on a phone each extra script is another round trip before the page
        // can run (the decision page went from fourteen files to a handful). The framework and the
        // shared code change rarely and are cached apart from the page's own code.
        codeSplitting: {
          groups: [
            { name: 'react', test: /[\\/]node_modules[\\/](react|react-dom|scheduler|@tanstack[\\/](react-query|query-core))[\\/]/, priority: 2 },
            // decimal.js only: the decision page needs it for its prices. Shared's modules and zod are
            // left to the bundler, so a page loads only the modules it reaches (a group would put every
            // schema the app's forms use into a file the decision page loads too).
            { name: 'common', test: /[\\/]node_modules[\\/]decimal\.js[\\/]/, priority: 1 },
          ],
        },
      },
      treeshake: {
        // The shared workspace only declares values (schemas, helpers); a page keeps just the ones it uses.
        moduleSideEffects: (id) => (/[\\/]shared[\\/]src[\\/]/.test(id) ? false : undefined),
        // Building a schema (z.object(…), z.string().min(…), …) has no effect beyond its value, so a
        // module keeps only the schemas some page uses. (shared's message setup is zod's `config(…)`,
        // not `z.…`, so it is never dropped.)
        manualPureFunctions: ['z'],
      },
    },
  },
  test: {
    name: 'client',
    environment: 'jsdom',
    // One jsdom and one module graph per worker instead of per file: set-up fell from 53 s of
    // environment and 18 s of imports to about 5 s in all (41 files, 134 → 34 s wall). Each test
    // renders into a fresh container with its own QueryClient and restoreMocks undoes spies; the
    // files passed in shuffled file orders.
    isolate: false,
    include: ['src/**/*.test.{ts,tsx}', 'scripts/**/*.test.{ts,mjs}'],
    setupFiles: ['src/testing/setup.ts'],
    restoreMocks: true,
    // jsdom forms with search pickers take a few seconds each when the two cores are shared (the
    // default 5 s failed a picker test at load 12); shared allows 30 s and server 90 s likewise.
    testTimeout: 20_000,
  },
}));
