// @ts-check
import expoConfig from 'eslint-config-expo/flat.js';
import { defineConfig } from 'eslint/config';
import simpleImportSort from 'eslint-plugin-simple-import-sort';

/**
 * Expo's own rules for the app, typescript-eslint with type information for every
 * TypeScript file (a promise nobody awaits, a promise where a plain callback is
 * expected, a switch that forgets a case), and imports sorted. Formatting is
 * Prettier's (.prettierrc), not ESLint's.
 */
export default defineConfig([
  { ignores: ['dist/**', 'build/**', 'node_modules/**', '.data/**', 'test-output/**', '.expo/**', 'expo-env.d.ts'] },
  ...expoConfig,
  {
    files: ['**/*.ts', '**/*.tsx'],
    languageOptions: { parserOptions: { projectService: true, tsconfigRootDir: import.meta.dirname } },
    plugins: { 'simple-import-sort': simpleImportSort },
    rules: {
      '@typescript-eslint/no-floating-promises': 'error',
      '@typescript-eslint/no-misused-promises': 'error',
      '@typescript-eslint/switch-exhaustiveness-check': ['error', { considerDefaultExhaustiveForUnions: true }],
      'simple-import-sort/imports': 'error',
      'simple-import-sort/exports': 'error',
      'import/order': 'off',
      // default-exported libraries used by their members (psychrolib.SI, knex(…).raw) are fine
      'import/no-named-as-default-member': 'off',
    },
  },
]);
