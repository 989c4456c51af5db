/**
 * The neutral token stream both encodings (KVN text and XML) are turned into, so one reader per message
 * type checks order, required keywords, units and values for either encoding.
 */

/** `KEYWORD = value [unit]` (KVN) or `<KEYWORD units="unit">value</KEYWORD>` (XML). */
export interface KeywordToken {
  kind: 'keyword';
  line: number;
  keyword: string;
  value: string;
  /** Unit as written, without brackets; undefined when none was written. */
  unit?: string;
}

export interface CommentToken {
  kind: 'comment';
  line: number;
  text: string;
}

/** KVN block delimiters of the OEM (XML `<metadata>` and `<covarianceMatrix>` map onto them). */
export type BlockName = 'META_START' | 'META_STOP' | 'COVARIANCE_START' | 'COVARIANCE_STOP';

export interface BlockToken {
  kind: 'block';
  line: number;
  name: BlockName;
}

/** A whitespace-separated data line of an OEM (ephemeris line or covariance row). */
export interface DataToken {
  kind: 'data';
  line: number;
  fields: string[];
}

export type CcsdsToken = KeywordToken | CommentToken | BlockToken | DataToken;

/** Short description of a token for error messages. */
export function describeToken(token: CcsdsToken | undefined): string {
  if (!token) return 'the end of the file';
  switch (token.kind) {
    case 'keyword': return `keyword ${token.keyword}`;
    case 'comment': return 'a COMMENT';
    case 'block': return token.name;
    case 'data': return `a data line ('${token.fields.slice(0, 2).join(' ')} ...')`;
  }
}
