/**
 * The README's function tables are generated (help/readme.js, `npm run readme`) from the function catalogue
 * and the wrappers' JSDoc; this fails when the README disagrees with them, e.g. after a function was added.
 */
import * as fs from 'fs';
import { CATALOGUE_LIST, signatureText } from '../../functions/catalogue';
import { describeParam } from '../../functions/sheet/entry';

/* eslint-disable-next-line @typescript-eslint/no-require-imports */
const readme = require('../../help/readme') as {
  README: string;
  withTables(text: string): string;
  functionTables(): string;
};

test('README.md holds the function tables as the catalogue and the JSDoc give them (else run `npm run readme`)', () => {
  const text = fs.readFileSync(readme.README, 'utf8');
  expect(readme.withTables(text) === text ? 'up to date' : 'out of date: run `npm run readme`').toBe('up to date');
});

test('every function has a row with its syntax, and every argument its allowed values', () => {
  const tables = readme.functionTables();
  for (const fn of CATALOGUE_LIST) {
    expect(tables).toContain(`| \`${signatureText(fn)}\` | \`=ABTEST.${fn.id}(`);
    for (const p of fn.params)
      expect(tables).toContain(`| \`${p.name}\` | ${describeParam(p, fn).replace(/\|/g, '\\|')} |`);
  }
});
