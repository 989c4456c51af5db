/**
 * A small XML reader for the restricted shape of the CCSDS NDM/XML schemas (502.0-B section 8):
 * elements, attributes, text, the five predefined entities and numeric references, comments and the
 * XML declaration. No DTDs, CDATA or processing instructions beyond the declaration (refused with the
 * line), which the ODM schemas never need. Every element keeps the line it starts on.
 */
import { CcsdsFormatError } from '../errors.ts';

export interface XmlElement {
  name: string;
  attributes: Record<string, string>;
  children: XmlElement[];
  /** Concatenated text content (trimmed); empty for containers. */
  text: string;
  line: number;
}

/** XML white space: space, tab, CR, LF. */
function isSpace(code: number): boolean {
  return code === 32 || code === 10 || code === 9 || code === 13;
}

const ENTITIES: Readonly<Record<string, string>> = { lt: '<', gt: '>', amp: '&', quot: '"', apos: "'" };
const NAME = /[A-Za-z_][\w.:-]*/y;

const localName = (qualified: string): string => qualified.slice(qualified.indexOf(':') + 1);

/** A cursor over one document: the stages of the parse read from `pos` and move it on. */
class XmlReader {
  pos = 0;
  private readonly newlines: number[] = [];

  constructor(private readonly text: string) {
    for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) this.newlines.push(i);
  }

  /** 1-based line of a character offset: one more than the newlines before it (binary search). */
  lineAt(at: number): number {
    const { newlines } = this;
    let lo = 0;
    let hi = newlines.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (newlines[mid] < at) lo = mid + 1; else hi = mid;
    }
    return lo + 1;
  }

  fail(at: number, message: string): never {
    throw new CcsdsFormatError('xml', this.lineAt(at), message);
  }

  /** Replaces the entities and character references of raw text found at offset `at`. */
  decode(raw: string, at: number): string {
    return raw.indexOf('&') < 0 ? raw : raw.replace(/&(#x[0-9a-fA-F]+|#\d+|\w+);?/g, (m, body: string) => {
      if (!m.endsWith(';')) this.fail(at, `'&' must start an entity such as &amp;`);
      if (body.startsWith('#x')) return String.fromCodePoint(parseInt(body.slice(2), 16));
      if (body.startsWith('#')) return String.fromCodePoint(parseInt(body.slice(1), 10));
      const value = ENTITIES[body];
      return value ?? this.fail(at, `unknown entity &${body};`);
    });
  }

  /** Skips white space, comments and the XML declaration; refuses other markup declarations. */
  skipMisc(): void {
    const { text } = this;
    for (;;) {
      while (this.pos < text.length && isSpace(text.charCodeAt(this.pos))) this.pos++;
      if (text.startsWith('<!--', this.pos)) {
        const end = text.indexOf('-->', this.pos + 4);
        if (end < 0) this.fail(this.pos, 'unterminated comment');
        this.pos = end + 3;
      } else if (text.startsWith('<?', this.pos)) {
        const end = text.indexOf('?>', this.pos + 2);
        if (end < 0) this.fail(this.pos, 'unterminated declaration');
        if (!/^<\?xml\s/.test(text.slice(this.pos, this.pos + 6))) this.fail(this.pos, 'processing instructions are not supported');
        this.pos = end + 2;
      } else if (text.startsWith('<!', this.pos)) {
        this.fail(this.pos, 'DOCTYPE and CDATA sections are not supported in ODM XML here');
      } else {
        return;
      }
    }
  }

  readName(): string {
    NAME.lastIndex = this.pos;
    const m = NAME.exec(this.text);
    if (!m) return this.fail(this.pos, 'expected an element or attribute name');
    this.pos = NAME.lastIndex;
    return m[0];
  }

  private skipSpace(): void {
    while (isSpace(this.text.charCodeAt(this.pos))) this.pos++;
  }

  /** An element from its start tag to its end tag, children included. */
  readElement(): XmlElement {
    const start = this.pos;
    if (this.text[this.pos] !== '<') this.fail(this.pos, 'expected an element');
    this.pos++;
    const qualified = this.readName();
    const element: XmlElement = { name: localName(qualified), attributes: {}, children: [], text: '', line: this.lineAt(start) };
    if (this.readAttributes(element, qualified, start) === 'empty') return element;
    this.readContent(element, qualified, start);
    return element;
  }

  /** The attributes of a start tag, up to its '>' ('open') or '/>' ('empty'). */
  private readAttributes(element: XmlElement, qualified: string, start: number): 'open' | 'empty' {
    const { text } = this;
    for (;;) {
      this.skipSpace();
      if (text.startsWith('/>', this.pos)) { this.pos += 2; return 'empty'; }
      if (text[this.pos] === '>') { this.pos++; return 'open'; }
      if (this.pos >= text.length) this.fail(start, `unterminated start tag <${qualified}>`);
      const attr = this.readName();
      this.skipSpace();
      if (text[this.pos] !== '=') this.fail(this.pos, `attribute ${attr} has no value`);
      this.pos++;
      this.skipSpace();
      const quote = text[this.pos];
      if (quote !== '"' && quote !== "'") this.fail(this.pos, `attribute ${attr} value must be quoted`);
      const end = text.indexOf(quote, this.pos + 1);
      if (end < 0) this.fail(this.pos, `unterminated value of attribute ${attr}`);
      element.attributes[localName(attr)] = this.decode(text.slice(this.pos + 1, end), this.pos);
      this.pos = end + 1;
    }
  }

  /** Text and child elements up to the matching end tag; text and elements may not mix. */
  private readContent(element: XmlElement, qualified: string, start: number): void {
    const { text } = this;
    let textContent = '';
    for (;;) {
      const lt = text.indexOf('<', this.pos);
      if (lt < 0) this.fail(start, `element <${qualified}> is not closed`);
      textContent += this.decode(text.slice(this.pos, lt), this.pos);
      this.pos = lt;
      if (text.startsWith('</', this.pos)) {
        this.pos += 2;
        const closing = this.readName();
        if (closing !== qualified) this.fail(this.pos, `</${closing}> closes <${qualified}> opened on line ${element.line}`);
        this.skipSpace();
        if (text[this.pos] !== '>') this.fail(this.pos, `malformed end tag </${closing}>`);
        this.pos++;
        break;
      }
      if (text.startsWith('<!--', this.pos) || text.startsWith('<?', this.pos) || text.startsWith('<!', this.pos)) {
        this.skipMisc();
        continue;
      }
      element.children.push(this.readElement());
    }
    element.text = textContent.trim();
    if (element.children.length > 0 && element.text !== '') {
      this.fail(start, `element <${qualified}> mixes text and elements`);
    }
  }
}

/** Parses an XML document into its root element, or throws CcsdsFormatError with the line. */
export function parseXml(text: string): XmlElement {
  const reader = new XmlReader(text);
  reader.skipMisc();
  if (reader.pos >= text.length) reader.fail(reader.pos, 'no root element');
  const root = reader.readElement();
  reader.skipMisc();
  if (reader.pos < text.length) reader.fail(reader.pos, 'content after the root element');
  return root;
}
