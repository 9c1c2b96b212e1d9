// ESLint flat config: JS recommended, typescript-eslint recommended, Vue 3 recommended
// (with the TypeScript parser inside <script lang="ts">).
import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import pluginVue from 'eslint-plugin-vue';
import globals from 'globals';
// Last: turns off the rules that only decide layout, which Prettier owns (`npm run format`).
import prettier from 'eslint-config-prettier/flat';

export default tseslint.config(
  {
    ignores: ['dist/**', 'node_modules/**', 'drizzle/**', '.data/**', '.tmp/**', 'coverage/**', '.server-build/**'],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  ...pluginVue.configs['flat/recommended'],
  {
    files: ['**/*.vue'],
    languageOptions: {
      parserOptions: { parser: tseslint.parser, extraFileExtensions: ['.vue'], sourceType: 'module' },
      globals: { ...globals.browser },
    },
  },
  {
    files: ['src/**/*.ts'],
    languageOptions: { globals: { ...globals.browser } },
  },
  {
    files: ['server/**/*.ts', 'scripts/**/*.{ts,mjs,js}', 'tests/**/*.ts', '*.{js,mjs,ts}', 'shared/**/*.ts'],
    languageOptions: { globals: { ...globals.node } },
  },
  {
    rules: {
      // Unused names are mistakes, except deliberate placeholders like `_req`.
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none', ignoreRestSiblings: true },
      ],
      // Whitespace layout is not the linter's job here (as with a formatter): these Vue rules
      // only move line breaks and indentation. Attribute order and self-closing stay on.
      'vue/max-attributes-per-line': 'off',
      'vue/singleline-html-element-content-newline': 'off',
      'vue/first-attribute-linebreak': 'off',
      'vue/html-indent': 'off',
      'vue/html-closing-bracket-newline': 'off',
      'vue/html-self-closing': ['warn', { html: { void: 'always', normal: 'never', component: 'always' } }],
      // Quasar's QForm/QTable etc. have single-word names in the app too (e.g. App.vue).
      'vue/multi-word-component-names': ['error', { ignores: ['App'] }],
    },
  },
  prettier,
);
