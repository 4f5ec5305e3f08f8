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

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'coverage/**', 'data/**', 'tests/artifacts/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { 'import-x': importX },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/consistent-type-imports': ['error', { fixStyle: 'inline-type-imports' }],
      'no-console': 'off',
      'import-x/no-restricted-paths': [
        'error',
        {
          zones: [
            ...featureZones,
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
    settings: { 'import-x/resolver-next': [createTypeScriptImportResolver({ project: './tsconfig.json' })] },
  },
  {
    files: ['src/**/*.{ts,tsx}'],
    plugins: { 'react-hooks': reactHooks },
    rules: { ...reactHooks.configs.recommended.rules },
  },
);
