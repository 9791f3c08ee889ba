/**
 * Browser tests of the preview (`npm run test:browser`): Debian's chromium through playwright-core,
 * one test file at a time (--runInBand). dist/ is built first when missing or stale (test/setup/buildForTests.js);
 * see test/browser/previewHelpers.ts.
 */
module.exports = {
  testEnvironment: 'node',
  transform: { '^.+\\.ts$': ['ts-jest', { tsconfig: 'tsconfig.json', diagnostics: { warnOnly: false } }] },
  testMatch: ['<rootDir>/test/browser/**/*.test.ts'],
  setupFiles: ['<rootDir>/test/setup/customFunctions.ts'],
  globalSetup: '<rootDir>/test/setup/buildForTests.js',
  testTimeout: 180000,
};
