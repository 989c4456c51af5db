/**
 * Splits Keyword = Value Notation text (CCSDS 502.0-B, section 7) into tokens with line numbers.
 * Only lexical checks here (line shape, keyword spelling); what may appear where is the readers' job.
 */
import { CcsdsFormatError } from '../errors.ts';
import type { BlockName, CcsdsToken } from './tokens.ts';

const BLOCKS: readonly BlockName[] = ['META_START', 'META_STOP', 'COVARIANCE_START', 'COVARIANCE_STOP'];
/** Longest KVN line, in characters without the line end (502.0-B section 7, from memory). */
export const MAX_LINE_CHARS = 254;
/** Keywords are upper-case letters, digits and underscores, starting with a letter (502.0-B 7.4). */
const KEYWORD_LINE = /^([A-Z][A-Z0-9_]*)\s*=\s*(.*)$/;
/** A value with an optional trailing unit in square brackets. */
const VALUE_WITH_UNIT = /^(.*?)\s*\[([^\]]*)\]$/;

/** Tokenises KVN text. Blank lines are skipped; `COMMENT text` lines become comment tokens; lines that
 * are neither `KEYWORD = value`, a block delimiter nor a comment become data lines (OEM only). */
export function lexKvn(text: string): CcsdsToken[] {
  const tokens: CcsdsToken[] = [];
  const lines = text.split(/\r\n|\n|\r/);
  for (let i = 0; i < lines.length; i++) {
    const lineNo = i + 1;
    const raw = lines[i];
    if (/[^\t\x20-\x7e]/.test(raw)) {
      throw new CcsdsFormatError('file', lineNo, 'contains a character outside printable ASCII '
        + '(502.0-B 7.2 allows ASCII only)');
    }
    if (raw.length > MAX_LINE_CHARS) {
      throw new CcsdsFormatError('file', lineNo, `line of ${raw.length} characters; KVN lines hold at most `
        + `${MAX_LINE_CHARS} (502.0-B section 7, from memory)`);
    }
    const line = raw.trim();
    if (line === '') continue;
    if (line === 'COMMENT' || line.startsWith('COMMENT ') || line.startsWith('COMMENT\t')) {
      tokens.push({ kind: 'comment', line: lineNo, text: line.slice(7).trim() });
      continue;
    }
    if ((BLOCKS as readonly string[]).includes(line)) {
      tokens.push({ kind: 'block', line: lineNo, name: line as BlockName });
      continue;
    }
    const kv = KEYWORD_LINE.exec(line);
    if (kv) {
      const [, keyword, rest] = kv;
      const withUnit = VALUE_WITH_UNIT.exec(rest);
      const value = (withUnit ? withUnit[1] : rest).trim();
      if (value === '') throw new CcsdsFormatError(keyword, lineNo, `${keyword} has no value`);
      tokens.push(withUnit
        ? { kind: 'keyword', line: lineNo, keyword, value, unit: withUnit[2].trim() }
        : { kind: 'keyword', line: lineNo, keyword, value });
      continue;
    }
    if (line.includes('=')) {
      throw new CcsdsFormatError('file', lineNo, `'${line.slice(0, 40)}' is not 'KEYWORD = value' with an `
        + 'upper-case keyword');
    }
    tokens.push({ kind: 'data', line: lineNo, fields: line.split(/\s+/) });
  }
  return tokens;
}
