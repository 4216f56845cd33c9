// Three projects: the shared core and the server run under ts-jest in Node; components under jest-expo.
const tsJestNode = {
  transform: {
    '^.+\\.tsx?$': [
      'ts-jest',
      {
        isolatedModules: true,
        tsconfig: {
          module: 'commonjs',
          moduleResolution: 'node',
          target: 'es2022',
          esModuleInterop: true,
          jsx: 'react-jsx',
          allowJs: true,
          verbatimModuleSyntax: false,
        },
      },
    ],
  },
  moduleNameMapper: { '^@/(.*)$': '<rootDir>/$1' },
  testEnvironment: 'node',
};

module.exports = {
  testTimeout: 120000,
  // Two workers even on a 2-core machine: with one, jest runs every file in its own process and the heap
  // grows until it fails; workers are recycled once they hold more than the limit.
  maxWorkers: 2,
  workerIdleMemoryLimit: '1536MB',
  projects: [
    { displayName: 'shared', ...tsJestNode, testMatch: ['<rootDir>/shared/**/*.test.ts'] },
    {
      displayName: 'server',
      ...tsJestNode,
      testMatch: ['<rootDir>/sync-server/**/*.test.ts', '<rootDir>/tests/server/**/*.test.ts'],
      globalSetup: '<rootDir>/tests/support/server-global-setup.ts',
      globalTeardown: '<rootDir>/tests/support/server-global-teardown.ts',
    },
    {
      displayName: 'app',
      preset: 'jest-expo',
      setupFiles: ['<rootDir>/tests/support/app-jest-setup.ts'],
      setupFilesAfterEnv: ['<rootDir>/tests/support/app-jest-after-env.ts'],
      testMatch: [
        '<rootDir>/features/**/*.test.ts?(x)',
        '<rootDir>/ui/**/*.test.ts?(x)',
        '<rootDir>/device/**/*.test.ts?(x)',
        '<rootDir>/api/**/*.test.ts?(x)',
      ],
      moduleNameMapper: {
        '^@/(.*)$': '<rootDir>/$1',
        '\\.css$': '<rootDir>/tests/support/style-stub.js',
        // The browser build of uuid is ES modules only; jest runs CommonJS, so components that make ids load.
        '^uuid$': '<rootDir>/node_modules/uuid/dist/cjs-browser/index.js',
      },
    },
    {
      displayName: 'e2e',
      ...tsJestNode,
      testMatch: ['<rootDir>/tests/e2e/**/*.e2e.ts'],
      testEnvironment: '<rootDir>/tests/support/e2e-environment.ts',
      setupFilesAfterEnv: ['<rootDir>/tests/support/e2e-failure-report.ts'],
      globalSetup: '<rootDir>/tests/support/e2e-global-setup.ts',
      globalTeardown: '<rootDir>/tests/support/e2e-global-teardown.ts',
    },
  ],
};
