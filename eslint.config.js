// Lint: the import directions of STYLE.md §2 as zones, no cycles, ordered imports, type-only imports.
import js from '@eslint/js';
import importX from 'eslint-plugin-import-x';
import globals from 'globals';
import tseslint from 'typescript-eslint';

const zone = (target, from, message) => ({ target, from, message });

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
      'import-x/no-cycle': ['error', { maxDepth: 10, ignoreExternal: true }],
      'import-x/no-restricted-paths': [
        'error',
        {
          zones: [
            zone('./shared', './src', 'shared/ is used by the browser, the server and the CLI: it may not import the client.'),
            zone('./shared', './server', 'shared/ may not import server code: move what both need into shared/.'),
            zone('./shared', './bin', 'shared/ may not import the CLI.'),
            zone('./src', './server', 'The client talks to the server over HTTP only; response types are z.infer of shared schemas.'),
            zone('./src', './bin', 'The client may not import the CLI.'),
            zone('./server', './src', 'server/ never imports the client.'),
            zone('./server', './bin', 'server/ never imports the CLI: bin/ calls server, not the other way.'),
            zone('./src/components', './src/features', 'Shared UI components may not import a feature.'),
            zone('./src/lib', './src/features', 'src/lib may not import a feature.'),
          ],
        },
      ],
    },
  },
  {
    files: ['shared/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            { group: ['node:*', 'fs', 'path', 'crypto'], message: 'shared/ is pure: no Node built-ins.' },
            { group: ['react', 'react-dom', 'express', 'drizzle-orm', 'drizzle-orm/*', 'pg'], message: 'shared/ is pure: no UI, HTTP or database packages.' },
          ],
        },
      ],
    },
  },
);
