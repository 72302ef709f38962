// Lint: typescript-eslint's recommended rules on all TypeScript, and the Office
// add-in rules (load before read, sync after load, no sync in loops…) on
// the code that calls Office.js. CI runs `npm run lint`, which allows no warnings.
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import officeAddins from 'eslint-plugin-office-addins';

const officeRules = Object.fromEntries(Object.keys(officeAddins.rules).map((name) => [`office-addins/${name}`, 'error']));

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'coverage/**', 'test-artifacts/**', 'src/physics/fdtd/wasm/tmz-step-wasm.ts'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    files: ['**/*.{ts,mts}'],
    rules: {
      // Worksheet functions take `any` where Excel passes numbers, text or ranges (the custom-functions metadata needs it).
      '@typescript-eslint/no-explicit-any': 'off',
      // Table text and terminal output escape control characters on purpose: regular expressions name them.
      'no-control-regex': 'off',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
  {
    files: ['src/workbook/**/*.ts', 'taskpane/**/*.ts', 'src/functions/**/*.ts'],
    plugins: { 'office-addins': officeAddins },
    rules: officeRules,
  },
  {
    files: ['**/*.js', '**/*.cjs'],
    languageOptions: { sourceType: 'commonjs', globals: { require: 'readonly', module: 'writable', process: 'readonly', __dirname: 'readonly', console: 'readonly', Buffer: 'readonly', URL: 'readonly', setTimeout: 'readonly' } },
    rules: { '@typescript-eslint/no-require-imports': 'off', 'no-control-regex': 'off' },
  },
);
