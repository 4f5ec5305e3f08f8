import { existsSync, readdirSync } from 'node:fs';
import js from '@eslint/js';
import { createTypeScriptImportResolver } from 'eslint-import-resolver-typescript';
import importX from 'eslint-plugin-import-x';
import reactHooks from 'eslint-plugin-react-hooks';
import globals from 'globals';
import tseslint from 'typescript-eslint';

// One feature never imports another: routes in src/app compose them. The zones are built from the
// folders that exist, so a new feature is covered without editing this file.
const featuresDir = new URL('./src/features', import.meta.url);
const features = (existsSync(featuresDir) ? readdirSync(featuresDir, { withFileTypes: true }) : [])
  .filter((entry) => entry.isDirectory())
  .map((entry) => entry.name);
const featureZones = features.map((feature) => ({
  target: `./src/features/${feature}`,
  from: './src/features',
  except: [`./${feature}`],
  message: 'A feature does not import another feature; compose them in src/app.',
}));

// The engine (statistics and the CSV reader) is a library the server, the CLI and the workers
// call; it knows nothing of HTTP, the database, mail or the workflow. server/runtime.ts (how to find
// and start a worker thread, Node built-ins only) is the one thing below it.
const engineZones = [
  {
    target: './server/stats',
    from: './server',
    except: ['./stats', './runtime.ts'],
    message: 'server/stats/ is the engine: it imports only itself, shared/ and server/runtime.ts.',
  },
  {
    target: './server/reader',
    from: './server',
    except: ['./reader', './stats', './runtime.ts'],
    message: 'server/reader/ is the engine\'s reader: it imports only itself, server/stats/, shared/ and server/runtime.ts.',
  },
  { target: './server/runtime.ts', from: './server', except: ['./runtime.ts'], message: 'server/runtime.ts uses Node built-ins only.' },
  { target: './server/mail', from: './server/stats', message: 'Mail wording formats numbers with shared/format.ts, not the engine.' },
  {
    target: ['./server/jobs/runner.ts', './server/jobs/handlers.ts'],
    from: ['./server/comparisons', './server/governance', './server/policy', './server/notes', './server/holdouts', './server/users', './server/mail', './server/stats'],
    message: 'The job queue knows jobs, not comparisons: what a run means comes in through its handlers (server/jobs/handlers.ts), wired in app.ts and index.ts.',
  },
];

// Server features talk through each other's services, not their internals. What one feature may
// import from another: its service.ts, and the files listed here, each for a stated reason. Every
// other crossing fails lint; the feature itself, the wiring (app.ts, index.ts, context.ts) and the
// worker threads (jobs/*-worker.ts) are not restricted. docs/architecture.md lists the same.
const serverFeatureSurface = {
  auth: {
    'guards.ts': 'every router reads the signed-in person (currentUser)',
    'tokens.ts': 'inviting a person and the create-admin CLI issue one-time links',
  },
  users: { 'present.ts': 'how the API shows a person (presentUser, personRef)' },
  holdouts: { 'columns.ts': "the stored column encoding, which the analysis's input and prepared data decode" },
  comparisons: {
    'state.ts': 'a workflow step moves the comparison to its next state (transition)',
    'authors.ts': 'the four-eyes rule asks who shaped the evidence',
    'people.ts': "a workflow e-mail goes to the comparison's creator",
    'present.ts': 'the evidence export shows each run as the API does',
    'scenarios.ts': 'the evidence export and the demo list and save cut-off scenarios',
    'csv.ts': 'every CSV export uses the one formula-safe writer and download name',
    'prepared-cache.ts': 'a verdict on the current run reuses its prepared swap-set data',
    'mixed-strategy.ts': 'a decision stores the conditional adoption computed on the validated run, and the demo committee previews it',
    'current-verdict.ts': 'a verdict record is shown as the current verdict is, with who recorded it',
  },
  governance: {
    'links.ts': 'the run-finished e-mail links to the comparison',
    'verdicts.ts': 'a finished run records its verdict under the current policy',
    'audit-trail.ts': "the committee pack prints the comparison's audit trail",
  },
  notes: {},
  policy: {},
  pack: { 'links.ts': 'the decision e-mail links to the committee pack' },
};
const serverConsumers = [...Object.keys(serverFeatureSurface), 'audit', 'mail', 'demo', 'cli'];
const serverFeatureZones = serverConsumers.flatMap((consumer) =>
  Object.entries(serverFeatureSurface)
    .filter(([feature]) => feature !== consumer)
    .map(([feature, surface]) => {
      const open = ['service.ts', ...Object.keys(surface)];
      return {
        target: `./server/${consumer}`,
        from: `./server/${feature}`,
        except: open.map((file) => `./${file}`),
        message: `server/${consumer}/ uses server/${feature}/ through ${open.join(', ')} only (serverFeatureSurface in eslint.config.js says why each is open).`,
      };
    }),
);

const tsProjects = ['./shared/tsconfig.json', './server/tsconfig.json', './src/tsconfig.json', './tests/tsconfig.json', './tsconfig.node.json'];

export default tseslint.config(
  // wasm/: AssemblyScript (compiled to WebAssembly by scripts/build-wasm.mjs), not TypeScript.
  { ignores: ['dist/**', 'node_modules/**', 'coverage/**', 'data/**', 'tests/artifacts/**', 'wasm/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    plugins: { 'import-x': importX },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
      'no-console': 'off',
      'import-x/no-cycle': ['error', { ignoreExternal: true }],
      'import-x/no-restricted-paths': [
        'error',
        {
          zones: [
            ...featureZones,
            ...serverFeatureZones,
            ...engineZones,
            { target: './shared', from: './server', message: 'shared/ is imported by server and client, never the reverse.' },
            { target: './shared', from: './src', message: 'shared/ is imported by server and client, never the reverse.' },
            { target: './src', from: './server', message: 'The client never imports server code; use shared/.' },
            { target: './server', from: './src', message: 'The server never imports client code.' },
            {
              target: ['./src/components', './src/lib'],
              from: ['./src/features', './src/app'],
              message: 'Shared client code does not depend on features or routes.',
            },
            { target: './src/features', from: './src/app', message: 'Features do not import routes.' },
          ],
        },
      ],
    },
    settings: { 'import-x/resolver-next': [createTypeScriptImportResolver({ project: tsProjects, noWarnOnMultipleProjects: true })] },
  },
  // Globals per zone, as the TypeScript projects give each its own lib and types: the browser's in
  // the client, Node's in the server and the tools, neither in shared/.
  { files: ['src/**/*.{ts,tsx}'], languageOptions: { globals: { ...globals.browser } } },
  { files: ['shared/**/*.ts'], languageOptions: { globals: { ...globals['shared-node-browser'] } } },
  {
    files: ['server/**/*.ts', 'scripts/**', 'bench/**', 'sample-data/**', '*.{js,ts,mjs}'],
    languageOptions: { globals: { ...globals.node } },
  },
  { files: ['tests/**/*.{ts,tsx,mjs}'], languageOptions: { globals: { ...globals.node, ...globals.browser } } },
  {
    // The unit suite shares loaded modules between test files (vitest.config.ts, isolate: false), so
    // a module replaced with vi.mock stays real wherever an earlier file loaded it first: the test
    // passes or fails by file order. Pass the behaviour in instead (the app's deps, a parameter).
    files: ['tests/**/*.{ts,tsx}'],
    rules: {
      'no-restricted-syntax': [
        'error',
        {
          selector: "CallExpression[callee.object.name='vi'][callee.property.name=/^(mock|doMock)$/]",
          message: 'vi.mock does not take under shared modules (vitest.config.ts isolate: false); pass the behaviour in through the app deps or a parameter.',
        },
      ],
    },
  },
  // Type-aware rules for the server: a promise nobody awaits or handles loses its error. The
  // project service finds server/tsconfig.json for each file (a little less work than naming it:
  // 28 s against 30 s of CPU for a cold lint of server/).
  {
    files: ['server/**/*.ts'],
    languageOptions: { parserOptions: { projectService: true, tsconfigRootDir: import.meta.dirname } },
    rules: {
      '@typescript-eslint/no-floating-promises': 'error',
      '@typescript-eslint/no-misused-promises': ['error', { checksVoidReturn: { arguments: false } }],
    },
  },
  // What the server stores is stamped with now() from server/clock.ts (the demo seed replays its
  // past through it, and a decision is written at one moment), never with the machine's clock.
  {
    files: ['server/**/*.ts'],
    ignores: ['server/clock.ts'],
    rules: {
      'no-restricted-syntax': [
        'error',
        { selector: "NewExpression[callee.name='Date'][arguments.length=0]", message: 'Stamp with now() from server/clock.ts, not new Date().' },
        {
          selector: "NewExpression[callee.name='Date'] > :matches(CallExpression, BinaryExpression) :matches(CallExpression[callee.object.name='Date'][callee.property.name='now'])",
          message: 'Stamp with now() from server/clock.ts (now().getTime() + ms), not Date.now().',
        },
        {
          selector: "NewExpression[callee.name='Date'] > CallExpression[callee.object.name='Date'][callee.property.name='now']",
          message: 'Stamp with now() from server/clock.ts, not new Date(Date.now()).',
        },
      ],
    },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: { ...reactHooks.configs.recommended.rules },
  },
);
