// Lint: the layering rule at error level, plus TypeScript's recommended checks.
import tseslint from 'typescript-eslint';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { layeringRule } from './main/build/layering-rule.mjs';

const repoRoot = path.dirname(fileURLToPath(import.meta.url));

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'artifacts/**', 'release/**', 'coverage/**'] },
  {
    files: ['**/*.ts', '**/*.tsx', '**/*.mjs', '**/*.js'],
    extends: [tseslint.configs.recommended],
    plugins: { layline: { rules: { layering: layeringRule(repoRoot) } } },
    rules: {
      'layline/layering': 'error',
      '@typescript-eslint/no-explicit-any': 'error',
      '@typescript-eslint/ban-ts-comment': 'error',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      'no-restricted-syntax': ['error', { selector: "CallExpression[callee.object.name='Math'][callee.property.name='random']", message: 'Use an injected, seeded generator (shared/inference/rng) so results are reproducible.' }],
    },
  },
  {
    files: ['shared/**/*.ts'],
    rules: {
      'no-restricted-globals': ['error', 'window', 'document', 'navigator', 'localStorage', 'sessionStorage', 'process', 'Buffer', 'require', '__dirname'],
    },
  },
  {
    files: ['test/**/*.ts', 'test/**/*.tsx'],
    rules: { 'no-restricted-syntax': 'off' },
  },
);
