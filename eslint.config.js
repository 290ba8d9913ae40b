// One flat config for the whole repository. Not type-checked on purpose: it stays fast
// enough to run on every save and in `npm test`; `npm run typecheck` covers types.
import { defineConfig, globalIgnores } from 'eslint/config';
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import pluginQuery from '@tanstack/eslint-plugin-query';
import globals from 'globals';

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
  // shared/ runs in both: only what browsers and Node have in common.
  { files: ['shared/**/*.ts'], languageOptions: { globals: { ...globals['shared-node-browser'] } } },
]);
