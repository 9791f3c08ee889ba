/**
 * Data types as worksheet-function inputs. functions.json is generated with
 * allowCustomDataForDataTypeAny: true (custom-functions-metadata writes it), so Excel passes a cell
 * holding a data type to an `any` parameter as its JSON object rather than a plain value. The shapes below
 * follow the Excel JavaScript API reference (@types/office-js 1.0.612: DoubleCellValue has type "Double"
 * and basicValue the number; EntityCellValue has basicType "Error", basicValue "#VALUE!" and text, the
 * text shown in the cell). Names and counts are invented (the garden-supply demo).
 */
import { classifyCell } from '../../functions/sheet/cells';
import { COMPARISON, readConversions, runSheet } from '../../functions/sheet';
import { labelOf } from '../../functions/sheet/decision';
import { thrownWorksheetError } from '../helpers/assertions';

const formatted = (n: number) => ({ type: 'Double', basicType: 'Double', basicValue: n, numberFormat: '#,##0' });
const entity = (text: string) => ({ type: 'Entity', basicType: 'Error', basicValue: '#VALUE!', text, properties: {} });

test('a formatted number is read as its number', () => {
  expect(classifyCell(formatted(10050))).toEqual({ kind: 'number', value: 10050 });
  const read = readConversions([[412], [formatted(455)]], [[formatted(10000)], [10050]], COMPARISON);
  expect(read.variants).toEqual([
    { conversions: 412, visitors: 10000 },
    { conversions: 455, visitors: 10050 },
  ]);
});

test('an entity is read as the text it shows: a label, and text where a count belongs', () => {
  expect(classifyCell(entity('Orange button'))).toEqual({ kind: 'text', text: 'Orange button' });
  expect(labelOf(entity('Orange button'), 1)).toBe('Orange button');
  const error = thrownWorksheetError(() =>
    runSheet(() => readConversions([[412], [455]], [[10000], [entity('Big basket icon')]], COMPARISON)),
  );
  expect(error.code).toBe('#VALUE!');
  expect(error.message).toBe(
    'visitors, item 2: "Big basket icon" is text, not a number; enter a whole number, at least 1 (convert text with VALUE() if needed)',
  );
});

test('an entity whose basic value is a number is still the text it shows (a card is a label, not a count)', () => {
  const card = { type: 'Entity', basicType: 'Double', basicValue: 2428, text: '2428', properties: {} };
  expect(classifyCell(card)).toEqual({ kind: 'text', text: '2428' });
  expect(classifyCell({ type: 'Entity', basicValue: { nested: true } })).toEqual({
    kind: 'text',
    text: 'a linked data type',
  });
});

test('an object without a plain value stays "not a number", in plain words', () => {
  expect(classifyCell({ type: 'Other', basicValue: { nested: true } })).toEqual({
    kind: 'other',
    description: 'a value that is not a plain number',
  });
});
