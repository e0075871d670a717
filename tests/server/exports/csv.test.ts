import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parse } from 'csv-parse/sync';
import { buildCsv, guardFormula, unguardFormula } from '../../../server/exports/csv';

// RFC 4180, section 2: rule 2 (CRLF after each record), 6 (a field with a line break, a quote or
// a comma is quoted), 7 (a quote inside a quoted field is doubled). csv-parse, an independent
// parser from npm, reads the output back.
describe('CSV writer (RFC 4180)', () => {
  it('quotes fields with commas, quotes, line breaks or semicolons, doubles quotes, ends records in CRLF', () => {
    expect(buildCsv([['a', 'b,c', 'say "hi"', 'two\nlines', 'x;y'], ['plain', 1, 37.5]])).toBe('a,"b,c","say ""hi""","two\nlines","x;y"\r\nplain,1,37.5\r\n');
  });

  it('guards text a spreadsheet would run as a formula, and only text', () => {
    expect(buildCsv([['=SUM(A1)', '+1', '-2', '@cmd', '\tx', '\rx', "'quoted", 'a=b', -3]])).toBe(`'=SUM(A1),'+1,'-2,'@cmd,'\tx,"'\rx",'quoted,a=b,-3\r\n`);
    expect(unguardFormula(guardFormula('=1+2'))).toBe('=1+2');
    // An apostrophe a person typed is kept: only one in front of a formula character is ours,
    // and typed apostrophes before a formula character get one more on the way out.
    expect(unguardFormula("'hello")).toBe("'hello");
    expect(guardFormula("'=x")).toBe("''=x");
    expect(unguardFormula(guardFormula("'=x"))).toBe("'=x");
  });

  it('starts with a UTF-8 byte order mark when asked', () => {
    const text = buildCsv([['Zoë']], { bom: true });
    expect([...Buffer.from(text, 'utf8').subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    expect(parse(text, { bom: true })).toEqual([['Zoë']]);
  });

  it('round-trips any text through csv-parse (cells unguarded as the import does)', () => {
    const char = fc.constantFrom('a', 'Z', ' ', ',', ';', '"', "'", '\r', '\n', '\t', '=', '+', '-', '@', 'é', '€', '😀');
    const cell = fc.array(char, { maxLength: 8 }).map((cs) => cs.join(''));
    // One column of only empty strings would be a blank line, which RFC 4180 does not give a field count for.
    const rows = fc.integer({ min: 1, max: 4 }).chain((width) => fc.array(fc.array(cell, { minLength: width, maxLength: width }), { minLength: 1, maxLength: 6 })).filter((rs) => rs.every((r) => r.some((c) => c !== '')));
    fc.assert(
      fc.property(rows, (rs) => {
        const text = buildCsv(rs);
        expect(text.endsWith('\r\n')).toBe(true);
        const back = (parse(text, { relax_column_count: false }) as string[][]).map((r) => r.map(unguardFormula));
        expect(back).toEqual(rs);
      }),
      { numRuns: 300 },
    );
  });
});
