// One Jest run, several projects: `npm test` runs them all (see scripts/test-all.ts);
// `npx jest --selectProjects solvers` runs one. A throwaway PostgreSQL cluster is started
// once for the whole run by test/support/global-setup.ts unless QT_TEST_PG_ADMIN_URL is set.
const nodeTransform = {
  '^.+\\.ts$': ['ts-jest', {
    tsconfig: {
      module: 'commonjs',
      moduleResolution: 'node10',
      target: 'ES2022',
      esModuleInterop: true,
      isolatedModules: true,
      resolveJsonModule: true,
      strict: true,
      skipLibCheck: true,
      baseUrl: '.',
      paths: { '@shared/*': ['shared/*'], '@solvers/*': ['solvers/*'] },
    },
  }],
};
const aliases = {
  '^@shared/(.*)$': '<rootDir>/shared/$1',
  '^@solvers/(.*)$': '<rootDir>/solvers/$1',
};
const nodeProject = (name, roots, testMatch, extra = {}) => ({
  displayName: name,
  rootDir: __dirname,
  roots,
  testMatch,
  testEnvironment: 'node',
  transform: nodeTransform,
  moduleNameMapper: aliases,
  ...extra,
});

module.exports = {
  // testTimeout is a global option (Jest ignores it per project). Suites that talk to a real
  // PostgreSQL, real processes or a browser on a loaded 2-core machine need more than 5 s.
  testTimeout: 60000,
  globalSetup: '<rootDir>/test/support/global-setup.ts',
  globalTeardown: '<rootDir>/test/support/global-teardown.ts',
  projects: [
    nodeProject('solvers', ['<rootDir>/solvers', '<rootDir>/benchmarks'], ['**/*.spec.ts']),
    nodeProject('shared', ['<rootDir>/shared'], ['**/*.spec.ts']),
    nodeProject('api', ['<rootDir>/api', '<rootDir>/scripts'], ['**/*.spec.ts']),
    nodeProject('integration', ['<rootDir>/test/integration'], ['**/*.spec.ts']),
    // Real worker processes, SIGKILL and a PostgreSQL restart (test/reliability/): slower, run alone.
    nodeProject('reliability', ['<rootDir>/test/reliability'], ['**/*.spec.ts']),
    nodeProject('e2e', ['<rootDir>/test/e2e'], ['**/*.e2e.ts']),
    {
      displayName: 'web',
      rootDir: __dirname,
      roots: ['<rootDir>/web/src'],
      testMatch: ['**/*.spec.ts'],
      preset: 'jest-preset-angular',
      testEnvironment: 'jest-preset-angular/environments/jest-jsdom-env',
      setupFilesAfterEnv: ['<rootDir>/web/src/test-setup.ts'],
      transform: {
        '^.+\\.(ts|js|mjs|html|svg)$': ['jest-preset-angular', {
          tsconfig: '<rootDir>/web/tsconfig.spec.json',
          stringifyContentPathRegex: '\\.(html|svg)$',
        }],
      },
      transformIgnorePatterns: ['node_modules/(?!.*\\.mjs$)'],
      // marked ships only ES modules to Node (exports "default"), which this CommonJS run cannot load; its UMD build is the same code.
      moduleNameMapper: { ...aliases, '^marked$': '<rootDir>/node_modules/marked/lib/marked.umd.js' },
    },
  ],
};
