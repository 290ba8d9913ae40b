// One flat config for the whole repository. Not type-checked on purpose: it stays fast
// enough to run on every save and in `npm test`; `npm run typecheck` covers types.
import { defineConfig, globalIgnores } from 'eslint/config';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import pluginQuery from '@tanstack/eslint-plugin-query';
import globals from 'globals';
import { importX, createNodeResolver } from 'eslint-plugin-import-x';
import { readdirSync } from 'node:fs';

/** Packages shared/ may use: it stays pure and browser-safe. */
const SHARED_PACKAGES = ['zod', 'date-fns', '@date-fns/tz'];
const FEATURES = readdirSync(new URL('./web/src/features', import.meta.url), { withFileTypes: true })
  .filter((d) => d.isDirectory())
  .map((d) => d.name);

const WEB = ['web/**/*.{ts,tsx}'];
const NODE = [
  'api/**/*.ts',
  'ingest/**/*.ts',
  'scripts/**/*.{ts,js,mjs}',
  'tests/**/*.ts',
  'simulators/**/*.ts',
  'bench/**/*.ts',
  'migrations/**/*.ts',
  '*.config.{ts,js}',
];

export default defineConfig([
  globalIgnores(['dist/', 'node_modules/', '.data/', 'test-results/', 'bench/results/', 'coverage/']),

  tseslint.configs.recommended,
  {
    rules: {
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_', destructuredArrayIgnorePattern: '^_', ignoreRestSiblings: true },
      ],
      '@typescript-eslint/no-explicit-any': 'warn',
    },
  },

  {
    files: WEB,
    extends: [reactHooks.configs.flat.recommended, pluginQuery.configs['flat/recommended']],
    languageOptions: { globals: globals.browser },
  },

  { files: NODE, languageOptions: { globals: globals.node } },

  // The house's layering: ingest → api → shared and web → shared, never back up; features stand
  // alone. tests/lint/layering.test.ts shows each rule failing on a bad import.
  {
    files: ['api/**/*.ts', 'ingest/**/*.ts', 'shared/**/*.ts', 'web/**/*.{ts,tsx}'],
    plugins: { 'import-x': importX },
    settings: {
      'import-x/resolver-next': [createNodeResolver({ extensions: ['.ts', '.tsx', '.js'] })],
      'import-x/parsers': { '@typescript-eslint/parser': ['.ts', '.tsx'] },
      'import-x/extensions': ['.ts', '.tsx', '.js'],
    },
    rules: {
      'import-x/no-cycle': ['error', { ignoreExternal: true }],
      'import-x/no-restricted-paths': [
        'error',
        {
          zones: [
            { target: './api', from: './ingest', message: 'api/ must not import ingest/: ingest is an entry point that uses the API.' },
            { target: './shared', from: ['./api', './ingest', './web', './scripts', './simulators', './bench'], message: 'shared/ is pure: it imports only itself.' },
            { target: './web', from: ['./api', './ingest', './scripts', './simulators', './bench'], message: 'web/ talks to the API over HTTP and socket.io and imports only shared/.' },
            ...FEATURES.map((name) => ({
              target: `./web/src/features/${name}`,
              from: './web/src/features',
              except: [`./${name}`],
              message: 'Features never import each other: move what both need to components/ or lib/.',
            })),
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
        { patterns: [{ regex: `^(?!\\.|(${SHARED_PACKAGES.join('|')})(/|$))`, message: `shared/ may import only itself and ${SHARED_PACKAGES.join(', ')}.` }] },
      ],
    },
  },
  // shared/ runs in both: only what browsers and Node have in common.
  { files: ['shared/**/*.ts'], languageOptions: { globals: { ...globals['shared-node-browser'] } } },
]);
