import { describe, expect, test } from 'vitest';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { escapeFormulaCell } from '../../../../shared/domain/csv-safety';

describe('escapeFormulaCell — OWASP CSV Injection guidance', () => {
  test.each([
    ['=1+2', "'=1+2"],
    ['=HYPERLINK("http://example.invalid","click")', '\'=HYPERLINK("http://example.invalid","click")'],
    ['+1', "'+1"],
    ['-2+3', "'-2+3"],
    ['-18', "'-18"], // a negative number is prefixed too
    ['@SUM(A1:A2)', "'@SUM(A1:A2)"],
    ['\tcmd', "'\tcmd"], // TAB (0x09)
    ['\r=1', "'\r=1"], // CR (0x0D)
    ['\0x', "'\0x"], // NUL
    ['Juniper Lane', 'Juniper Lane'],
    ['a=b', 'a=b'], // only the first character matters
    [' =1', ' =1'],
    ['', ''],
    ["'already", "'already"],
    ['\n=1', '\n=1'], // LF is handled by quoting, not by the apostrophe
  ])('%j → %j', (input, output) => {
    expect(escapeFormulaCell(input)).toBe(output);
  });

  test.each([
    [42, '42'],
    [-5, "'-5"],
    [true, 'true'],
    [null, ''],
    [undefined, ''],
  ])('%j → %j', (input, output) => {
    expect(escapeFormulaCell(input)).toBe(output);
  });

  test('escaped cells survive an RFC 4180 round trip through a strict parser', () => {
    const row = ['=1+2', 'a,b', 'say "hi"', 'two\r\nlines', '-5', 'Crème brûlée'];
    const csv = stringify([row.map(escapeFormulaCell)], { record_delimiter: '\r\n', quoted_match: /\r|\n/ });
    const [back] = parse(csv, { relax_quotes: false, record_delimiter: '\r\n' }) as string[][];
    expect(back).toEqual(["'=1+2", 'a,b', 'say "hi"', 'two\r\nlines', "'-5", 'Crème brûlée']);
    expect(csv.endsWith('\r\n')).toBe(true);
  });
});
