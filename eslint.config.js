// Lint for the whole repository: typescript-eslint's recommended rules, React hook rules for
// the browser code, and the import boundaries of STYLE.md ("imports point inward, toward shared/").
import { builtinModules } from 'node:module';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

const nodeBuiltins = [...builtinModules, ...builtinModules.map((m) => `node:${m}`)];

/** Import patterns (gitignore syntax, matched against the import string) that leave a folder's allowed area. */
const reach = {
  src: ['@/*', '**/src/*', '**/src'],
  server: ['@server/*', '**/server/*', '**/server'],
  worker: ['**/worker/*', '**/worker'],
};

const boundary = (patterns, message) => ({ group: patterns, message });

export default tseslint.config(
  {
    ignores: ['node_modules/', 'dist/', 'coverage/', 'artifacts/', '.data/', '.test-data/', '**/*.d.ts'],
  },
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node }, ecmaVersion: 2023, sourceType: 'module' },
    rules: {
      // Unused arguments named _x are deliberate (Express error handlers need four).
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }],
      // TypeORM's entity lists and similar registries are typed as Function[].
      '@typescript-eslint/no-unsafe-function-type': 'off',
    },
  },
  {
    // shared/: pure TypeScript for browser, server and worker alike.
    files: ['shared/**/*.ts'],
    languageOptions: { globals: {} },
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: nodeBuiltins.map((name) => ({ name, message: 'shared/ runs in the browser too: no Node built-ins.' })),
          patterns: [
            boundary([...reach.src, ...reach.server, ...reach.worker], 'shared/ imports nothing from src/, server/ or worker/.'),
            boundary(['node:*', 'react', 'react-dom', 'react/*', 'react-dom/*'], 'shared/ stays free of Node built-ins and React.'),
            boundary(['typeorm', 'express', 'bullmq', 'ioredis', 'pg', 'pino'], 'shared/ stays free of server libraries.'),
          ],
        },
      ],
      'no-restricted-globals': ['error', 'window', 'document', 'navigator', 'localStorage', 'process', 'Buffer', '__dirname', 'require'],
    },
  },
  {
    // src/: the browser app imports shared/ and itself only.
    files: ['src/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'react-hooks': reactHooks },
    rules: {
      // The classic hook rules. The plugin's React Compiler rules (state set in effects, refs read
      // in render, …) are left out: the app is not built with the compiler.
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'warn',
      'no-restricted-imports': [
        'error',
        {
          paths: nodeBuiltins.map((name) => ({ name, message: 'src/ runs in the browser: no Node built-ins.' })),
          patterns: [boundary([...reach.server, ...reach.worker, 'node:*'], 'src/ imports shared/ and itself only (STYLE.md).')],
        },
      ],
    },
  },
  {
    // server/: imports shared/ and itself, never the browser app or the worker.
    files: ['server/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', { patterns: [boundary([...reach.src, ...reach.worker], 'server/ imports shared/ and itself, never src/ or worker/.')] }],
    },
  },
  {
    // worker/: imports shared/ and server/, never the browser app.
    files: ['worker/**/*.ts'],
    rules: {
      'no-restricted-imports': ['error', { patterns: [boundary(reach.src, 'worker/ imports shared/ and server/, never src/.')] }],
    },
  },
  {
    // Tests may import anything; they run in Node (web tests under jsdom).
    files: ['tests/**/*.{ts,tsx}'],
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
  },
);
