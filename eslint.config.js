// ESLint for Benchrelay: type-aware TypeScript rules, React hooks and accessibility in the client, and the
// layers of the design (STYLE.md, "Know your room") checked on every import by eslint-plugin-boundaries.
// tests/unit/design/boundaries.test.ts proves the layer rules still report what they must.
import js from '@eslint/js';
import boundaries from 'eslint-plugin-boundaries';
import jsxA11y from 'eslint-plugin-jsx-a11y';
import reactHooks from 'eslint-plugin-react-hooks';
import prettier from 'eslint-config-prettier';
import globals from 'globals';
import tseslint from 'typescript-eslint';

const tsFiles = ['**/*.{ts,tsx}'];
const clientFiles = ['src/**/*.{ts,tsx}'];
const nodeFiles = ['server/**/*.ts', 'workers/**/*.ts', 'docker-free-dev/**/*.ts', 'tests/**/*.{ts,tsx}', '*.{js,ts}'];

/**
 * The rooms of the design. A file belongs to the first element whose folder holds it; imports inside one
 * element (one feature, one server module, ...) are the element's own business and are not checked.
 */
const elements = [
  { type: 'app', pattern: 'src/app', partialMatch: false },
  { type: 'feature', pattern: 'src/features/*', capture: ['feature'], partialMatch: false },
  { type: 'client', pattern: 'src', partialMatch: false }, // lib/, components/ui/, main.tsx
  { type: 'shared', pattern: 'shared', partialMatch: false },
  { type: 'server-module', pattern: 'server/modules/*', capture: ['module'], partialMatch: false },
  { type: 'server', pattern: 'server', partialMatch: false }, // app.ts, start.ts, lib/, migrations/, seed/
  { type: 'workers', pattern: 'workers', partialMatch: false },
  { type: 'dev-tools', pattern: 'docker-free-dev', partialMatch: false },
  { type: 'tests', pattern: 'tests', partialMatch: false },
];

const to = (...types) => ({ to: { element: { types: types.length === 1 ? types[0] : types } } });

/**
 * What each room may import. Anything no policy allows is reported (`default: 'disallow'`); where several
 * policies match an import the last one decides, so each room's refusal (with its explanation) comes
 * before the narrower permission that overrides it.
 */
const layerPolicies = [
  {
    from: { element: { type: 'feature' } },
    disallow: to('feature', 'app'),
    message:
      'A feature never imports another feature or src/app: features are composed in src/app (STYLE.md, "Know your room").',
  },
  {
    from: { element: { type: 'shared' } },
    disallow: to('app', 'feature', 'client', 'server', 'server-module', 'workers', 'dev-tools', 'tests'),
    message: 'shared/ runs in the browser and on the server: it imports nothing from src/, server/ or workers/.',
  },
  {
    from: { element: { type: 'server-module' } },
    disallow: to('server-module'),
    message:
      "A server module reaches another module only through that module's public entry, server/modules/<area>/index.ts.",
  },
  {
    from: { element: { type: 'client' } },
    disallow: to('app', 'feature'),
    message: 'src/lib and src/components sit below the features: they import only shared/.',
  },
  { from: { element: { type: ['app', 'feature', 'client'] } }, disallow: to('server', 'server-module', 'workers', 'dev-tools', 'tests'), message: 'Browser code never imports server code: share it through shared/.' },

  { from: { element: { type: 'app' } }, allow: to('feature', 'client', 'shared') },
  { from: { element: { type: 'feature' } }, allow: to('client', 'shared') },
  { from: { element: { type: 'client' } }, allow: to('shared') },
  // main.tsx starts the client: it mounts the router and providers of src/app.
  { from: { element: { type: 'client', fileInternalPath: 'main.tsx' } }, allow: to('app') },
  { from: { element: { type: 'server-module' } }, allow: to('server', 'shared') },
  { from: { element: { type: 'server-module' } }, allow: { to: { element: { type: 'server-module', fileInternalPath: 'index.ts' } } } },
  { from: { element: { type: 'server' } }, allow: to('server-module', 'workers', 'shared') },
  { from: { element: { type: 'workers' } }, allow: to('server', 'server-module', 'shared') },
  { from: { element: { type: 'dev-tools' } }, allow: to('server', 'server-module', 'shared') },
  { from: { element: { type: 'tests' } }, allow: to('app', 'feature', 'client', 'shared', 'server-module', 'server', 'workers', 'dev-tools') },
];

/** Node's globals and built-in modules have no place in code that runs in the browser. */
const nodeOnlyGlobals = ['process', 'Buffer', 'global', 'require', 'module', '__dirname', '__filename', 'setImmediate'].map((name) => ({
  name,
  message: 'This runs in the browser: Node globals are not available here.',
}));
const nodeBuiltins = {
  patterns: [{ group: ['node:*'], message: 'This runs in the browser too: no Node built-in modules.' }],
};

export default tseslint.config(
  {
    ignores: ['dist/**', 'build/**', 'coverage/**', '.data/**', 'test-results/**', 'public/**', 'node_modules/**'],
  },
  {
    linterOptions: { reportUnusedDisableDirectives: 'error' },
  },
  js.configs.recommended,
  {
    files: tsFiles,
    extends: [tseslint.configs.recommendedTypeChecked],
    languageOptions: {
      parserOptions: {
        // the three real projects (strict, each with its own globals); the root tsconfig.json is only a solution file
        project: ['./tsconfig.client.json', './tsconfig.server.json', './tsconfig.tests.json'],
        tsconfigRootDir: import.meta.dirname,
      },
    },
    rules: {
      // `_`-prefixed names are deliberately unused (a required parameter position, a destructured rest).
      '@typescript-eslint/no-unused-vars': [
        'error',
        { argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrorsIgnorePattern: '^_', ignoreRestSiblings: true },
      ],
    },
  },
  {
    files: ['**/*.js'],
    extends: [tseslint.configs.disableTypeChecked],
  },
  {
    files: ['tests/**/*.{ts,tsx}'],
    rules: {
      // Tests read answers as supertest gives them: `res.body` is `any` by design, and each test states the
      // shape it expects with `expect(...)`. Typing every body would mean hand copies of the response types;
      // switch these back on once the response types live in shared/ (issue 14, point 4).
      '@typescript-eslint/no-unsafe-argument': 'off',
      '@typescript-eslint/no-unsafe-assignment': 'off',
      '@typescript-eslint/no-unsafe-call': 'off',
      '@typescript-eslint/no-unsafe-member-access': 'off',
      '@typescript-eslint/no-unsafe-return': 'off',
    },
  },
  {
    files: nodeFiles,
    languageOptions: { globals: { ...globals.node } },
  },
  {
    files: clientFiles,
    languageOptions: { globals: { ...globals.browser } },
    plugins: { 'react-hooks': reactHooks },
    extends: [jsxA11y.flatConfigs.recommended],
    rules: {
      ...reactHooks.configs.recommended.rules,
      'no-restricted-globals': ['error', ...nodeOnlyGlobals],
      'no-restricted-imports': ['error', nodeBuiltins],
      // A component's `autoFocus` prop only passes the choice on; the DOM element where it lands is checked.
      'jsx-a11y/no-autofocus': ['error', { ignoreNonDOM: true }],
    },
  },
  {
    files: ['shared/**/*.ts'],
    rules: {
      'no-restricted-globals': ['error', ...nodeOnlyGlobals],
      'no-restricted-imports': ['error', nodeBuiltins],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}', 'shared/**/*.ts', 'server/**/*.ts', 'workers/**/*.ts', 'docker-free-dev/**/*.ts', 'tests/**/*.{ts,tsx}'],
    plugins: { boundaries },
    settings: {
      'boundaries/elements': elements,
      // browser-only declarations of two packages (see tsconfig.client.json), not a room of their own
      'boundaries/ignore': ['src/lib/browser-types/**'],
      'boundaries/include': ['src/**/*', 'shared/**/*', 'server/**/*', 'workers/**/*', 'docker-free-dev/**/*', 'tests/**/*'],
      'import/resolver': {
        typescript: {
          // the server must not see the client's browser-only mappings of `qrcode` and `papaparse`
          project: ['tsconfig.server.json', 'tsconfig.client.json', 'tsconfig.tests.json'],
          noWarnOnMultipleProjects: true,
        },
      },
    },
    rules: {
      'boundaries/dependencies': ['error', { default: 'disallow', policies: layerPolicies }],
    },
  },
  // Formatting is Prettier's job (`npm run format:check`): switch off every stylistic rule that could disagree.
  prettier,
);
