/** Unit, layer and bundle tests (`npm test`). Browser tests live in jest.browser.config.js. */
module.exports = {
  testEnvironment: 'node',
  transform: { '^.+\\.ts$': ['ts-jest', { tsconfig: 'tsconfig.json', diagnostics: { warnOnly: false } }] },
  testMatch: ['<rootDir>/test/**/*.test.ts'],
  testPathIgnorePatterns: ['/node_modules/', '<rootDir>/test/browser/'],
  setupFiles: ['<rootDir>/test/setup/customFunctions.ts'],
  // builds dist/ when missing or stale and writes the panel's texts, so `npm install && npm test` passes
  globalSetup: '<rootDir>/test/setup/buildForTests.js',
  moduleNameMapper: { '^office-addin-manifest$': '<rootDir>/test/setup/officeAddinManifestStub.js' },
};
