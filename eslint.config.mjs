import js from '@eslint/js';
import tseslint from 'typescript-eslint';

export default tseslint.config(
  { ignores: ['node_modules/**', 'dist/**', '.data/**', 'artifacts/**', '.expo/**', 'expo-env.d.ts'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  {
    languageOptions: {
      globals: {
        console: 'readonly',
        process: 'readonly',
        setTimeout: 'readonly',
        clearTimeout: 'readonly',
        setInterval: 'readonly',
        clearInterval: 'readonly',
        URL: 'readonly',
        fetch: 'readonly',
        Buffer: 'readonly',
        __dirname: 'readonly',
        require: 'readonly',
        module: 'writable',
        self: 'readonly',
        window: 'readonly',
        document: 'readonly',
        navigator: 'readonly',
      },
    },
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
      '@typescript-eslint/no-require-imports': 'off',
    },
  },
  {
    // The server and the shared core run without the app: they may not reach into the client's folders. What both
    // sides need (cautions, consent wording, sites, schemas) lives in shared/.
    files: ['sync-server/**', 'shared/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              regex: '^(@/|(\\.\\./)+)(app|api|components|constants|device|features|hooks|ui)(/|$)',
              message:
                'The server and shared/ may not import client code; move what both sides need into shared/.',
            },
          ],
        },
      ],
    },
  },
  {
    // ui/ is the primitives every feature builds on: it never reaches up into a feature or the device's own code
    // (a feature hands it what it needs, as the role tabs hand ScreenFrame the account bar).
    files: ['ui/**'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          patterns: [
            {
              regex: '^(@/|(\\.\\./)+)(app|features|device)(/|$)',
              message:
                'ui/ may not import features/, device/ or app/: pass what it needs in, or move it into ui/.',
            },
          ],
        },
      ],
    },
  },
);
