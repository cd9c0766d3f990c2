// @ts-check
import tseslint from 'typescript-eslint';
import angular from 'angular-eslint';

export default tseslint.config(
  {
    ignores: [
      'node_modules/',
      'dist/',
      'data/',
      '.angular/',
      'e2e/artifacts/',
      'bench/out/',
      '.tmp/',
      'coverage/',
    ],
  },
  {
    files: ['**/*.ts'],
    extends: [...tseslint.configs.recommended],
    rules: {
      '@typescript-eslint/consistent-type-imports': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    // Migrations never import the app's types: Kysely<any> is the documented way to write them.
    files: ['migrations/**/*.ts', 'server/src/db/migrate.ts'],
    rules: { '@typescript-eslint/no-explicit-any': 'off' },
  },
  {
    files: ['apps/web/**/*.ts'],
    extends: [...angular.configs.tsRecommended],
    processor: angular.processInlineTemplates,
    rules: {
      '@angular-eslint/component-selector': ['error', { type: 'element', prefix: 'cb', style: 'kebab-case' }],
      '@angular-eslint/directive-selector': [
        'error',
        { type: 'attribute', prefix: 'cb', style: 'camelCase' },
      ],
      // the schemas' entry brings zod into the browser: the web app takes types from it, values from /values
      '@typescript-eslint/no-restricted-imports': [
        'error',
        {
          paths: [
            {
              name: '@clearbase/contracts',
              allowTypeImports: true,
              message:
                'Import plain values (roles, limits, header names, enums) from @clearbase/contracts/values.',
            },
          ],
        },
      ],
    },
  },
  {
    files: ['apps/web/**/*.html'],
    extends: [...angular.configs.templateRecommended, ...angular.configs.templateAccessibility],
  },
);
