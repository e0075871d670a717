/**
 * Writes the rule and term tables of docs/roster-format.md from the catalogue, so a rule's name,
 * limits, unit, default and source are written once (in the rule's module and catalogue-words.ts):
 *   npx tsx solver/roster/rules/write-docs.ts
 * tests/shared/roster-format-doc.test.ts fails when the doc and the catalogue disagree.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { rulesTableMarkdown, termsTableMarkdown } from './catalogue-words';

export const RULES_MARK = ['<!-- rules table: written by solver/roster/rules/write-docs.ts -->', '<!-- end of rules table -->'] as const;
export const TERMS_MARK = ['<!-- terms table: written by solver/roster/rules/write-docs.ts -->', '<!-- end of terms table -->'] as const;

/** `doc` with the text between each pair of marks replaced by the catalogue's table. */
export function withCatalogueTables(doc: string): string {
  const put = (text: string, [open, close]: readonly [string, string], table: string) => {
    const a = text.indexOf(open);
    const b = text.indexOf(close);
    if (a < 0 || b < a) throw new Error(`docs/roster-format.md lacks the marks ${open} … ${close}`);
    return `${text.slice(0, a + open.length)}\n${table}\n${text.slice(b)}`;
  };
  return put(put(doc, RULES_MARK, rulesTableMarkdown()), TERMS_MARK, termsTableMarkdown());
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const file = new URL('../../../docs/roster-format.md', import.meta.url);
  writeFileSync(file, withCatalogueTables(readFileSync(file, 'utf8')));
  console.log(`wrote ${file.pathname}`);
}
