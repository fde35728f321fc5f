// Lint: the import directions of the layout (DEVELOPERS.md, Layout) as zones, no cycles, type-only
// imports, and configuration read from the environment in two places only (server/env.ts, bin/config.ts).
// Every zone message says who may not import what, and why.
import { readdirSync } from 'node:fs';
import js from '@eslint/js';
import importX from 'eslint-plugin-import-x';
import globals from 'globals';
import tseslint from 'typescript-eslint';

const zone = (target, from, message, except) => ({ target, from, message, ...(except ? { except } : {}) });

// One zone per feature: src/features/<a>/ may import its own folder and nothing else under src/features/.
// The list is read from the tree, so a new feature is covered the day it is added.
const features = readdirSync(new URL('./src/features/', import.meta.url), { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => d.name)
  .sort();
const featureZones = features.map((name) =>
  zone(
    `./src/features/${name}`,
    './src/features',
    `src/features/${name}/ may not import another feature: features are independent slices, so one can change or go without touching the others; move what two features share into src/components/ or src/lib/, or put them side by side in a route of src/app/.`,
    [`./${name}`],
  ),
);

const binToQueriesMessage =
  "bin/ may not import server/db/queries/: queries are the services' building blocks; a command calls a service (server/services/), an importer or a job, so the CLI and the API share one implementation.";

const zones = [
  zone('./shared', './src', 'shared/ may not import src/: shared code runs in the browser, the server and the CLI alike, so it cannot depend on the client.'),
  zone('./shared', './server', 'shared/ may not import server/: shared code runs in the browser too; move what both need into shared/.'),
  zone('./shared', './bin', 'shared/ may not import bin/: shared code runs in the browser and the server too, so it cannot depend on the CLI.'),
  zone('./src', './server', 'src/ may not import server/: the client talks to the server over HTTP only; response types are z.infer of shared schemas.'),
  zone('./src', './bin', 'src/ may not import bin/: the client runs in a browser, the CLI in a terminal; what both need lives in shared/.'),
  zone('./server', './src', 'server/ may not import src/: the server serves the built client, it never runs its code.'),
  zone('./server', './bin', 'server/ may not import bin/: bin/ calls server/, not the other way, so the server starts without the CLI.'),
  zone('./src/components', './src/features', 'src/components/ may not import a feature: shared UI is used by every feature, so it cannot depend on one; pass what it needs as props.'),
  zone('./src/lib', './src/features', 'src/lib/ may not import a feature: helpers are used by every feature, so they cannot depend on one.'),
  ...featureZones,
  zone('./bin', './server/routes', 'bin/ may not import server/routes/: routes are the HTTP layer; a command calls the services, importers, jobs and db/client.ts the routes call.'),
  zone('./bin', './server/db/queries', binToQueriesMessage),
];

// Where configuration may be read from the environment: the validated server environment, the CLI's
// own resolution, and what runs outside the app (benchmarks, tests, tool configs, the bootstrap that
// runs before dependencies exist).
const processEnvReaders = ['server/env.ts', 'bin/config.ts', 'bin/bootstrap.mjs', 'bench/**', 'tests/**', '*.config.{ts,js,mjs}'];

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'drizzle/**', 'reports/**', '.osmia/**', 'bench/out/**', 'tests/e2e/screenshots/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['**/*.{ts,tsx,js,mjs}'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { 'import-x': importX },
    settings: { 'import-x/resolver': { node: true } },
    rules: {
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', destructuredArrayIgnorePattern: '^_' }],
      '@typescript-eslint/no-explicit-any': 'error',
      // The n/no-process-env rule, with a core rule so no plugin is needed.
      'no-restricted-properties': [
        'error',
        {
          object: 'process',
          property: 'env',
          message:
            'This file may not read process.env: configuration is read and validated in one place, server/env.ts for the server and bin/config.ts for the CLI, so a wrong value fails at start with a clear message; take the value from the Env they give.',
        },
      ],
      'import-x/no-cycle': ['error', { maxDepth: 10, ignoreExternal: true }],
      'import-x/no-restricted-paths': ['error', { zones }],
    },
  },
  {
    files: ['shared/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            { group: ['node:*', 'fs', 'path', 'crypto'], message: 'shared/ may not import Node built-ins: shared code is pure and runs in the browser too.' },
            { group: ['react', 'react-dom', 'express', 'drizzle-orm', 'drizzle-orm/*', 'pg'], message: 'shared/ may not import UI, HTTP or database packages: shared code is pure (no I/O), so the maths can be tested alone.' },
          ],
        },
      ],
    },
  },
  {
    files: processEnvReaders,
    rules: { 'no-restricted-properties': 'off' },
  },

  // Known exceptions, each for exactly one file, until the code is changed (then delete the block).
  {
    // `user list` reads listUsers from the query module; server/services/users.ts has no list function
    // yet (GET /api/users reads the same query). Only that module is let through here.
    files: ['bin/commands/user.ts'],
    rules: {
      'import-x/no-restricted-paths': [
        'error',
        { zones: zones.map((z) => (z.message === binToQueriesMessage ? { ...z, except: ['./users.ts'] } : z)) },
      ],
    },
  },
  {
    // Not a setting: apt-get inherits the whole environment, plus DEBIAN_FRONTEND, when the private
    // cluster installs PostgreSQL.
    files: ['server/db/cluster.ts'],
    rules: { 'no-restricted-properties': 'off' },
  },
  {
    // The version in /api/health comes from npm_package_version (set only when npm runs the server);
    // it belongs in server/env.ts or package.json. Until then, this file only.
    files: ['server/routes/health.ts'],
    rules: { 'no-restricted-properties': 'off' },
  },
);
