// ESLint flat config for the whole project; lives beside CI's script so the top level stays as
// the design card fixes it. `basePath` points the patterns back at the project root.
import js from '@eslint/js';
import globals from 'globals';
import reactHooks from 'eslint-plugin-react-hooks';
import tseslint from 'typescript-eslint';

const serverOnly = { group: ['**/server/**', '*/server/*'], message: 'Only server/ may import server code.' };

export default tseslint.config(
  { basePath: '..' },
  { ignores: ['node_modules/**', 'server/dist/**', 'cli/dist/**', 'drizzle/**', 'tests/e2e/screenshots/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-non-null-assertion': 'off',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/consistent-type-imports': 'error',
    },
  },
  {
    files: ['src/**/*.{ts,tsx}', 'tests/src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    languageOptions: { globals: { ...globals.browser } },
    rules: { ...reactHooks.configs.recommended.rules },
  },
  {
    // The dashboard and the CLI talk to the server over HTTP only (STYLE.md, "Which way imports go").
    files: ['src/**/*.{ts,tsx}', 'cli/**/*.ts'],
    rules: { 'no-restricted-imports': ['error', { patterns: [serverOnly] }] },
  },
  {
    // Features do not reach into each other; shared pieces live in components/ or lib/.
    files: ['src/features/**/*.{ts,tsx}'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            serverOnly,
            {
              group: ['**/features/*/**'],
              message: 'A feature may not import another feature; compose them in app/.',
            },
          ],
        },
      ],
    },
  },
  {
    // shared/ is pure: no framework, no I/O, nothing from the three programs that use it.
    files: ['shared/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['**/server/**', '**/src/**', '**/cli/**'],
              message: 'shared/ imports only shared/ and small pure libraries.',
            },
            {
              group: ['react', 'react-*', 'express', 'drizzle-orm*', '@electric-sql/*', 'pg', 'node:*'],
              message: 'shared/ stays pure: no framework or I/O imports.',
            },
          ],
        },
      ],
    },
  },
);
