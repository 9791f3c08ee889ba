/**
 * Browser tests of the preview (`npm run test:browser`): Debian's chromium through playwright-core,
 * one test file at a time (--runInBand). Needs `npm run build` first (dist/); see test/browser/previewHelpers.ts.
 */
module.exports = {
  testEnvironment: 'node',
  transform: { '^.+\\.ts$': ['ts-jest', { tsconfig: 'tsconfig.json', diagnostics: { warnOnly: false } }] },
  testMatch: ['<rootDir>/test/browser/**/*.test.ts'],
  setupFiles: ['<rootDir>/test/setup/customFunctions.ts'],
  testTimeout: 180000,
};
