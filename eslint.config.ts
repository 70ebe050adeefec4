import { builtinModules } from 'node:module';
import type { Linter } from 'eslint';
import { defineConfigWithVueTs, vueTsConfigs } from '@vue/eslint-config-typescript';
import pluginVue from 'eslint-plugin-vue';
import vueI18n from '@intlify/eslint-plugin-vue-i18n';

// The layer rules of shared/README.md, server/README.md and src/README.md, enforced on every import.
// Each message says the rule it breaks and names the README it comes from.
type ImportPattern = { regex: string; message: string };

const NODE_ONLY = [`^node:`, `^(${builtinModules.filter((m) => !m.startsWith('_')).map((m) => m.replace(/[/]/g, '\\/')).join('|')})(/|$)`];

const sharedImports: ImportPattern[] = [
  { regex: '^(\\.\\./)+(server|src)(/|$)', message: 'shared/ imports nothing of server/ or src/: move the code into shared/ or pass it in (shared/README.md).' },
  { regex: '^@/', message: 'shared/ imports nothing of src/ (the @/ alias): shared code runs in the browser and on the server alike (shared/README.md).' },
  { regex: '^(vue|vue-router|pinia|primevue|express|sequelize|socket\\.io)(/|$)', message: 'shared/ is plain TypeScript: no Vue, Express, Sequelize or socket.io (shared/README.md).' },
  ...NODE_ONLY.map((regex) => ({ regex, message: 'shared/ uses no Node-only module: the browser runs it too (shared/README.md).' })),
];
const serverImports: ImportPattern[] = [
  { regex: '^(\\.\\./)+src(/|$)', message: 'server/ never imports src/: share it through shared/ (server/README.md).' },
  { regex: '^@/', message: 'server/ never imports src/ (the @/ alias): share it through shared/ (server/README.md).' },
];
const routeImports: ImportPattern[] = [
  ...serverImports,
  { regex: '^\\.\\./(models|db|migrations)(/|$)', message: 'Routes never touch models: parse, call a service, send (server/README.md).' },
  { regex: '^sequelize(/|$)', message: 'Routes never touch models: database work belongs in a service (server/README.md).' },
];
const serviceImports: ImportPattern[] = [
  ...serverImports,
  { regex: '^\\.\\./(middleware|routes)(/|$)', message: 'Services never import middleware or routes: take the actor as an argument (server/README.md).' },
  { regex: '^express(/|$)', message: 'Services never import middleware or routes, and see no req/res: the route passes what the work needs (server/README.md).' },
];
const clientImports: ImportPattern[] = [
  { regex: '^(\\.\\./)+server(/|$)', message: 'src/ never imports server/: share it through shared/ (src/README.md).' },
  { regex: '^(express|sequelize)(/|$)', message: 'src/ never imports server/ libraries: share it through shared/ (src/README.md).' },
];

const restrict = (files: string[], patterns: ImportPattern[], ignores: string[] = []): Linter.Config => ({
  files,
  ignores,
  rules: { 'no-restricted-imports': ['error', { patterns }] },
});

export default defineConfigWithVueTs(
  { ignores: ['dist/**', 'node_modules/**', 'coverage/**', 'test-results/**', '.data/**', 'scripts/bootstrap.mjs'] },
  pluginVue.configs['flat/recommended'],
  vueTsConfigs.recommended,
  {
    rules: {
      'vue/max-attributes-per-line': 'off',
      'vue/singleline-html-element-content-newline': 'off',
      'vue/html-self-closing': 'off',
      'vue/html-indent': 'off',
      'vue/html-closing-bracket-newline': 'off',
      'vue/multiline-html-element-content-newline': 'off',
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/no-non-null-assertion': 'off',
    },
  },
  // Every word a person sees goes through vue-i18n (shared/i18n/messages); marks, digits and units-free symbols may stay.
  {
    files: ['src/**/*.vue'],
    plugins: { '@intlify/vue-i18n': vueI18n },
    settings: { 'vue-i18n': { messageSyntaxVersion: '^11.0.0' } },
    rules: {
      '@intlify/vue-i18n/no-raw-text': ['error', { ignorePattern: '^[\\s\\d.,:;·•–—/%×+#()*?!’\'"…-]+$', ignoreText: ['L', 'mm', 'm³', 'gal', 'in', 'ft', '°C', '°F'], attributes: { '/.+/': ['title', 'aria-label', 'aria-description', 'placeholder', 'label', 'header', 'alt', 'empty-message', 'emptyMessage', 'on-label', 'off-label', 'summary', 'detail', 'legend'] } }],
    },
  },
  restrict(['shared/**/*.ts'], sharedImports),
  restrict(['server/**/*.ts'], serverImports, ['server/routes/**', 'server/services/**']),
  restrict(['server/routes/**/*.ts'], routeImports),
  restrict(['server/services/**/*.ts'], serviceImports),
  restrict(['src/**/*.{ts,vue}'], clientImports),
  {
    files: ['server/routes/**/*.ts'],
    rules: {
      'no-restricted-syntax': ['error', { selector: "MemberExpression[property.name='db']", message: 'Routes never touch models: ctx.db belongs in a service (server/README.md).' }],
    },
  },
  {
    files: ['src/**/*.{ts,vue}'],
    ignores: ['src/api/**'],
    rules: {
      'no-restricted-globals': ['error', { name: 'fetch', message: 'Components, views and stores never fetch: a store calls src/api/ (src/README.md).' }],
    },
  },
);
