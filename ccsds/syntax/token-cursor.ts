/**
 * Walks a token stream in the order the standard fixes, with one error style for everything missing,
 * misplaced or mis-united.
 */
import { CcsdsFormatError } from '../errors.ts';
import { type CcsdsToken, type KeywordToken, describeToken } from './tokens.ts';
import { parseNumber } from './values.ts';

export class TokenCursor {
  private index = 0;
  constructor(private readonly tokens: readonly CcsdsToken[], private readonly message: 'OPM' | 'OEM') {}

  peek(): CcsdsToken | undefined {
    return this.tokens[this.index];
  }

  next(): CcsdsToken | undefined {
    return this.tokens[this.index++];
  }

  /** Line of the next token, or of the last one at the end (for messages about what is missing). */
  line(): number {
    return (this.tokens[this.index] ?? this.tokens[this.tokens.length - 1])?.line ?? 0;
  }

  done(): boolean {
    return this.index >= this.tokens.length;
  }

  /** Consumes consecutive COMMENT lines (allowed at the start of the header, metadata and data blocks). */
  comments(): string[] {
    const out: string[] = [];
    for (let t = this.peek(); t?.kind === 'comment'; t = this.peek()) {
      out.push(t.text);
      this.index++;
    }
    return out;
  }

  /** True when the next token is `keyword`. */
  at(keyword: string): boolean {
    const t = this.peek();
    return t?.kind === 'keyword' && t.keyword === keyword;
  }

  /** Consumes the required `keyword` or throws naming what was found instead and where. */
  expect(keyword: string, unit?: string): KeywordToken {
    const t = this.peek();
    if (t?.kind !== 'keyword' || t.keyword !== keyword) {
      const where = t?.kind === 'comment' ? ' (COMMENT lines are allowed only at the start of a block)' : '';
      throw new CcsdsFormatError(keyword, t?.line ?? 0, `${this.message}: required keyword ${keyword} missing; `
        + `found ${describeToken(t)}${where}`);
    }
    this.index++;
    checkUnit(t, unit);
    return t;
  }

  /** Consumes `keyword` when it is next; undefined otherwise. */
  optional(keyword: string, unit?: string): KeywordToken | undefined {
    return this.at(keyword) ? this.expect(keyword, unit) : undefined;
  }

  /** Consumes a required numeric keyword. */
  number(keyword: string, unit?: string): number {
    const t = this.expect(keyword, unit);
    return parseNumber(keyword, t.line, t.value);
  }

  /** Consumes an optional numeric keyword. */
  optionalNumber(keyword: string, unit?: string): number | undefined {
    const t = this.optional(keyword, unit);
    return t && parseNumber(keyword, t.line, t.value);
  }
}

/** Units may be left out (they are informative in KVN) but, when written, must be the standard's own;
 * `n/a` is accepted for unitless values. Case is ignored (`KM` and `km` are read alike). */
export function checkUnit(token: KeywordToken, unit: string | undefined): void {
  if (token.unit === undefined) return;
  const written = token.unit.toLowerCase();
  if (unit === undefined ? written === 'n/a' || written === '' : written === unit.toLowerCase()) return;
  throw new CcsdsFormatError(token.keyword, token.line, `unit [${token.unit}] where the standard puts `
    + `${unit === undefined ? 'no unit' : `[${unit}]`}`);
}
