// @ts-check
import js from '@eslint/js';
import nextPlugin from '@next/eslint-plugin-next';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

export default tseslint.config(
  {
    ignores: [
      '**/node_modules/**',
      '**/.next/**',
      '**/.next-*/**',
      '**/dist/**',
      '**/.turbo/**',
      '**/next-env.d.ts',
      'packages/db/drizzle/**',
      'data/**',
      'tests/test-results/**',
      'tests/playwright-report/**',
    ],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node } },
    rules: {
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_' },
      ],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
    },
  },
  {
    files: ['apps/web/**/*.{ts,tsx}'],
    plugins: { '@next/next': nextPlugin, 'react-hooks': reactHooks },
    languageOptions: { globals: { ...globals.browser } },
    rules: {
      ...nextPlugin.configs.recommended.rules,
      ...nextPlugin.configs['core-web-vitals'].rules,
      'react-hooks/rules-of-hooks': 'error',
      'react-hooks/exhaustive-deps': 'error',
    },
    settings: { next: { rootDir: new URL('./apps/web/', import.meta.url).pathname } },
  },
  {
    // Environment variables are validated once, in apps/web/env.ts.
    files: ['apps/web/**/*.{ts,tsx}'],
    ignores: [
      'apps/web/env.ts',
      'apps/web/instrumentation.ts',
      'apps/web/next.config.ts',
      'apps/web/scripts/**',
    ],
    rules: {
      'no-restricted-properties': [
        'error',
        {
          object: 'process',
          property: 'env',
          message: 'Read environment variables through ~/env.',
        },
      ],
    },
  },
  {
    files: ['packages/metrics/src/**/*.ts'],
    ignores: ['packages/metrics/src/**/*.test.ts', 'packages/metrics/bench/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['@reelwright/db*', 'drizzle-orm*', 'next', 'next/*', 'react', 'react-*'],
              message: 'metrics is pure: no database, no framework.',
            },
          ],
        },
      ],
    },
  },
);
