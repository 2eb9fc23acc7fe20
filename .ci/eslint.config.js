// Lives in .ci/ to keep the repository root to the agreed list; run with `eslint -c .ci/eslint.config.js .`
import pluginVue from 'eslint-plugin-vue'
import { defineConfigWithVueTs, vueTsConfigs } from '@vue/eslint-config-typescript'
import vitest from '@vitest/eslint-plugin'
import globals from 'globals'

export default defineConfigWithVueTs(
  {
    ignores: [
      'dist/**',
      'node_modules/**',
      'uploads/**',
      '.data/**',
      'coverage/**',
      'tests/output/**',
    ],
  },
  pluginVue.configs['flat/recommended'],
  vueTsConfigs.recommended,
  {
    languageOptions: { globals: { ...globals.browser, ...globals.node } },
    rules: {
      'no-console': 'error',
      // Formatting belongs to Prettier.
      'vue/max-attributes-per-line': 'off',
      'vue/singleline-html-element-content-newline': 'off',
      'vue/html-self-closing': 'off',
      'vue/html-indent': 'off',
      'vue/multiline-html-element-content-newline': 'off',
      'vue/html-closing-bracket-newline': 'off',
      'vue/attributes-order': 'off',
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_' },
      ],
    },
  },
  {
    // Named exports only; default exports are for .vue files and configuration.
    files: ['src/**/*.ts', 'server/**/*.ts', 'shared/**/*.ts'],
    rules: {
      'no-restricted-syntax': [
        'error',
        { selector: 'ExportDefaultDeclaration', message: 'Use named exports.' },
      ],
    },
  },
  {
    // The engine is isomorphic: nothing from the browser, Node, Vue or Konva.
    files: ['shared/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              group: ['node:*', 'fs', 'path', 'os', 'crypto'],
              message: 'shared/ must not use Node APIs.',
            },
            {
              group: ['vue', 'vue-*', 'konva', 'pinia', 'primevue', 'primevue/*', '@/*'],
              message: 'shared/ must not depend on the client.',
            },
            {
              group: ['express', 'knex', 'mysql2', 'sharp'],
              message: 'shared/ must not depend on the server.',
            },
          ],
        },
      ],
    },
  },
  {
    // Command-line tools and the process entry point talk to the terminal.
    files: [
      'server/cli/**/*.ts',
      'server/bench/**/*.ts',
      'server/index.ts',
      'tests/support/**/*.ts',
    ],
    rules: { 'no-console': 'off' },
  },
  {
    files: ['tests/**/*.ts'],
    plugins: { vitest },
    rules: { ...vitest.configs.recommended.rules },
  },
)
