// Lint for the whole repository (ESLint flat config). `npm run lint` runs it with Prettier's check.
import js from '@eslint/js';
import angular from 'angular-eslint';
import { defineConfig } from 'eslint/config';
import tseslint from 'typescript-eslint';
import seasonwell from './scripts/lint/plugin.mjs';

// Node's globals for the plain .mjs scripts (TypeScript files get theirs from the compiler).
const nodeGlobals = Object.fromEntries(
  [
    'process',
    'console',
    'Buffer',
    'URL',
    'URLSearchParams',
    'fetch',
    'AbortController',
    'AbortSignal',
    'TextEncoder',
    'TextDecoder',
    'setTimeout',
    'clearTimeout',
    'setInterval',
    'clearInterval',
    'setImmediate',
    'queueMicrotask',
    'structuredClone',
  ].map((name) => [name, 'readonly']),
);

const tsRules = {
  // Leading underscore marks a parameter kept for its position; a rest sibling drops a field on purpose.
  '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none', ignoreRestSiblings: true }],
};

export default defineConfig(
  {
    ignores: ['dist/', 'node_modules/', '.data/', '.angular/', 'out-tsc/', 'coverage/', 'test-results/', 'playwright-report/', '.test-runs/', 'bench/results/', 'migrations/'],
  },
  {
    files: ['**/*.mjs', '**/*.js'],
    extends: [js.configs.recommended],
    languageOptions: { globals: nodeGlobals },
  },
  {
    files: ['server/**/*.ts', 'shared/**/*.ts', 'scripts/**/*.ts', 'test/**/*.ts', 'e2e/**/*.ts', '*.ts'],
    extends: [js.configs.recommended, tseslint.configs.recommended],
    rules: tsRules,
  },
  {
    // zod's `z` export is one namespace object the bundler cannot tree-shake: it ships every locale
    // and the JSON-schema code to the browser (92 kB gzip against 26 kB for the namespace import).
    files: ['shared/**/*.ts', 'src/**/*.ts'],
    rules: {
      'no-restricted-syntax': [
        'error',
        {
          selector: "ImportDeclaration[source.value='zod'][importKind='value'] > ImportSpecifier",
          message: "Write `import * as z from 'zod'`: the named export keeps all of zod in the client bundle.",
        },
      ],
    },
  },
  {
    files: ['server/**/*.ts'],
    plugins: { seasonwell },
    rules: { 'seasonwell/own-tables': 'error', 'seasonwell/no-client-import': 'error' },
  },
  {
    files: ['src/**/*.ts'],
    extends: [js.configs.recommended, tseslint.configs.recommended, angular.configs.tsRecommended],
    processor: angular.processInlineTemplates,
    rules: {
      ...tsRules,
      '@angular-eslint/component-selector': ['error', { type: 'element', prefix: 'sw', style: 'kebab-case' }],
      '@angular-eslint/directive-selector': ['error', { type: 'attribute', prefix: 'sw', style: 'camelCase' }],
    },
  },
  {
    files: ['src/**/*.html'],
    extends: [angular.configs.templateRecommended, angular.configs.templateAccessibility],
  },
);
