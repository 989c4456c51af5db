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

/** Parses an XML document into its root element, or throws CcsdsFormatError with the line. */
export function parseXml(text: string): XmlElement {
  let pos = 0;
  const newlines: number[] = [];
  for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) newlines.push(i);
  /** 1-based line of a character offset: one more than the newlines before it (binary search). */
  const lineAt = (at: number): number => {
    let lo = 0;
    let hi = newlines.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (newlines[mid] < at) lo = mid + 1; else hi = mid;
    }
    return lo + 1;
  };
  const fail = (at: number, message: string): never => {
    throw new CcsdsFormatError('xml', lineAt(at), message);
  };
  const decode = (raw: string, at: number): string => (raw.indexOf('&') < 0 ? raw : raw.replace(/&(#x[0-9a-fA-F]+|#\d+|\w+);?/g, (m, body: string) => {
    if (!m.endsWith(';')) fail(at, `'&' must start an entity such as &amp;`);
    if (body.startsWith('#x')) return String.fromCodePoint(parseInt(body.slice(2), 16));
    if (body.startsWith('#')) return String.fromCodePoint(parseInt(body.slice(1), 10));
    const value = ENTITIES[body];
    return value ?? fail(at, `unknown entity &${body};`);
  }));
  const skipMisc = (): void => {
    for (;;) {
      while (pos < text.length && isSpace(text.charCodeAt(pos))) pos++;
      if (text.startsWith('<!--', pos)) {
        const end = text.indexOf('-->', pos + 4);
        if (end < 0) fail(pos, 'unterminated comment');
        pos = end + 3;
      } else if (text.startsWith('<?', pos)) {
        const end = text.indexOf('?>', pos + 2);
        if (end < 0) fail(pos, 'unterminated declaration');
        if (!/^<\?xml\s/.test(text.slice(pos, pos + 6))) fail(pos, 'processing instructions are not supported');
        pos = end + 2;
      } else if (text.startsWith('<!', pos)) {
        fail(pos, 'DOCTYPE and CDATA sections are not supported in ODM XML here');
      } else {
        return;
      }
    }
  };
  const readName = (): string => {
    NAME.lastIndex = pos;
    const m = NAME.exec(text);
    if (!m) return fail(pos, 'expected an element or attribute name');
    pos = NAME.lastIndex;
    return m[0];
  };
  const localName = (qualified: string): string => qualified.slice(qualified.indexOf(':') + 1);

  const readElement = (): XmlElement => {
    const start = pos;
    if (text[pos] !== '<') fail(pos, 'expected an element');
    pos++;
    const qualified = readName();
    const element: XmlElement = { name: localName(qualified), attributes: {}, children: [], text: '', line: lineAt(start) };
    for (;;) {
      while (isSpace(text.charCodeAt(pos))) pos++;
      if (text.startsWith('/>', pos)) { pos += 2; return element; }
      if (text[pos] === '>') { pos++; break; }
      if (pos >= text.length) fail(start, `unterminated start tag <${qualified}>`);
      const attr = readName();
      while (isSpace(text.charCodeAt(pos))) pos++;
      if (text[pos] !== '=') fail(pos, `attribute ${attr} has no value`);
      pos++;
      while (isSpace(text.charCodeAt(pos))) pos++;
      const quote = text[pos];
      if (quote !== '"' && quote !== "'") fail(pos, `attribute ${attr} value must be quoted`);
      const end = text.indexOf(quote, pos + 1);
      if (end < 0) fail(pos, `unterminated value of attribute ${attr}`);
      element.attributes[localName(attr)] = decode(text.slice(pos + 1, end), pos);
      pos = end + 1;
    }
    let textContent = '';
    for (;;) {
      const lt = text.indexOf('<', pos);
      if (lt < 0) fail(start, `element <${qualified}> is not closed`);
      textContent += decode(text.slice(pos, lt), pos);
      pos = lt;
      if (text.startsWith('</', pos)) {
        pos += 2;
        const closing = readName();
        if (closing !== qualified) fail(pos, `</${closing}> closes <${qualified}> opened on line ${element.line}`);
        while (isSpace(text.charCodeAt(pos))) pos++;
        if (text[pos] !== '>') fail(pos, `malformed end tag </${closing}>`);
        pos++;
        break;
      }
      if (text.startsWith('<!--', pos) || text.startsWith('<?', pos) || text.startsWith('<!', pos)) {
        skipMisc();
        continue;
      }
      element.children.push(readElement());
    }
    element.text = textContent.trim();
    if (element.children.length > 0 && element.text !== '') {
      fail(start, `element <${qualified}> mixes text and elements`);
    }
    return element;
  };

  skipMisc();
  if (pos >= text.length) fail(pos, 'no root element');
  const root = readElement();
  skipMisc();
  if (pos < text.length) fail(pos, 'content after the root element');
  return root;
}
