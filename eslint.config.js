import js from '@eslint/js';
import tseslint from 'typescript-eslint';
import importX from 'eslint-plugin-import-x';
import globals from 'globals';

// Imports flow one way: shared ← server; shared ← src/lib|components ← src/features ← src/app.
export default tseslint.config(
  { ignores: ['dist/', 'node_modules/', '.data/', 'drizzle/', 'coverage/'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: { globals: { ...globals.node, ...globals.browser } },
    plugins: { 'import-x': importX },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/no-non-null-assertion': 'off',
      'no-restricted-syntax': ['error', { selector: "JSXAttribute[name.name='dangerouslySetInnerHTML']", message: 'dangerouslySetInnerHTML is not allowed.' }],
      'import-x/no-restricted-paths': [
        'error',
        {
          zones: [
            { target: './shared', from: ['./server', './src'], message: 'shared/ must stay free of server and client code.' },
            { target: './src', from: './server', message: 'The client never imports server code.' },
            { target: './server', from: './src', message: 'The server never imports client code.' },
            { target: './src/lib', from: ['./src/features', './src/app'] },
            { target: './src/components', from: ['./src/features', './src/app'] },
            { target: './src/features', from: './src/app' },
          ],
        },
      ],
    },
  },
);
