// ESLint flat config. Fast, syntax-only rules (no type-aware linting: `npm run typecheck`
// does the type work) and the import boundaries between the layers. See
// docs/decisions/016-lint-and-layers.md for the choices and the rules turned down.
import tseslint from 'typescript-eslint';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import { builtinModules } from 'node:module';

// Relative imports reaching a top-level folder: '../server/x', '../../src/y'.
const up = (folder) => `^(\\.\\./)+${folder}(/|$)`;

const layer = (files, message, { regex = [], names = [] }) => ({
  files,
  rules: {
    'no-restricted-imports': [
      'error',
      {
        patterns: [
          ...regex.map((r) => ({ regex: r, message })),
          ...(names.length ? [{ group: names, message }] : []),
        ],
      },
    ],
  },
});

export default tseslint.config(
  {
    ignores: ['dist/**', 'node_modules/**', 'drizzle/**', 'public/**', 'test-results/**', 'coverage/**', '.scratch/**'],
  },
  ...tseslint.configs.recommended,
  {
    languageOptions: {
      ecmaVersion: 2023,
      sourceType: 'module',
    },
    rules: {
      // `_`-prefixed names mark deliberately unused arguments and destructured leftovers.
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none', ignoreRestSiblings: true },
      ],
      // TypeScript reports undefined names itself, with the right lib for each layer.
      'no-undef': 'off',
    },
  },
  {
    // Test and benchmark harnesses cast into internals (fault injection, private pools); `any` stays there.
    files: ['tests/**', 'bench/**'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    languageOptions: { globals: { ...globals.browser } },
    rules: {
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
    },
  },
  {
    files: ['server/**/*.ts', 'scripts/**/*.ts', 'bench/**/*.ts', '*.config.{js,ts}'],
    languageOptions: { globals: { ...globals.node } },
  },

  // Layers. shared/ is the pure core: no client, server or script code, no React, Express or Node.
  layer(['shared/**'], 'shared/ is the pure core: it may not import the client, the server, scripts, React, Express or Node modules.', {
    regex: [up('src'), up('server'), up('scripts'), '^@/', '^node:'],
    names: ['react', 'react/*', 'react-dom', 'react-dom/*', 'express', 'express/*', ...builtinModules],
  }),
  layer(['src/**'], 'The client (src/) may not import server/ or scripts/ code.', {
    regex: [up('server'), up('scripts')],
  }),
  layer(['server/**'], 'The server may not import client code (src/).', {
    regex: [up('src'), '^@/'],
  }),
  layer(['scripts/**'], 'scripts/ may not import client code (src/).', {
    regex: [up('src'), '^@/'],
  }),
);
