/**
 * One entry for both encodings: KVN text is lexed line by line; XML (first non-blank character `<`) is
 * parsed and flattened onto the same tokens, so the readers check order, units and values once.
 */
import { CcsdsFormatError } from '../errors.ts';
import { lexKvn } from './kvn-lexer.ts';
import type { CcsdsToken } from './tokens.ts';
import { parseXml, type XmlElement } from './xml-tree.ts';

/** Which encoding a text is in. */
export function encodingOf(text: string): 'kvn' | 'xml' {
  return text.trimStart().startsWith('<') ? 'xml' : 'kvn';
}

/** Tokens of an OPM or OEM in either encoding. */
export function tokenise(text: string, kind: 'OPM' | 'OEM'): CcsdsToken[] {
  return encodingOf(text) === 'xml' ? xmlTokens(parseXml(text), kind) : lexKvn(text);
}

/** Ephemeris-line children of an OEM XML `<stateVector>`, with their units. */
const STATE_FIELDS: readonly [string, string | undefined][] = [
  ['EPOCH', undefined], ['X', 'km'], ['Y', 'km'], ['Z', 'km'], ['X_DOT', 'km/s'], ['Y_DOT', 'km/s'], ['Z_DOT', 'km/s'],
  ['X_DDOT', 'km/s**2'], ['Y_DDOT', 'km/s**2'], ['Z_DDOT', 'km/s**2'],
];

function xmlTokens(root: XmlElement, kind: 'OPM' | 'OEM'): CcsdsToken[] {
  if (root.name !== kind.toLowerCase()) {
    throw new CcsdsFormatError('xml', root.line, `root element <${root.name}> is not <${kind.toLowerCase()}>`);
  }
  const versionKeyword = `CCSDS_${kind}_VERS`;
  if (root.attributes.id !== versionKeyword || root.attributes.version === undefined) {
    throw new CcsdsFormatError(versionKeyword, root.line, `<${root.name}> needs id="${versionKeyword}" and a version`);
  }
  const tokens: CcsdsToken[] = [
    { kind: 'keyword', line: root.line, keyword: versionKeyword, value: root.attributes.version },
  ];
  const walk = (e: XmlElement): void => {
    if (e.children.length === 0 && !CONTAINERS.has(e.name)) {
      tokens.push(leafToken(e));
      return;
    }
    if (kind === 'OEM' && e.name === 'stateVector') {
      tokens.push(stateVectorToken(e));
      return;
    }
    const block = kind === 'OEM' ? BLOCKS[e.name] : undefined;
    if (block) tokens.push({ kind: 'block', line: e.line, name: block[0] });
    for (const child of e.children) walk(child);
    if (block) tokens.push({ kind: 'block', line: lastLine(e), name: block[1] });
  };
  for (const child of root.children) walk(child);
  return tokens;
}

const CONTAINERS = new Set([
  'header', 'body', 'segment', 'metadata', 'data', 'stateVector', 'keplerianElements', 'spacecraftParameters',
  'covarianceMatrix', 'maneuverParameters', 'userDefinedParameters',
]);
const BLOCKS: Readonly<Record<string, readonly ['META_START' | 'COVARIANCE_START', 'META_STOP' | 'COVARIANCE_STOP']>> = {
  metadata: ['META_START', 'META_STOP'],
  covarianceMatrix: ['COVARIANCE_START', 'COVARIANCE_STOP'],
};

function lastLine(e: XmlElement): number {
  return e.children.length ? lastLine(e.children[e.children.length - 1]) : e.line;
}

function leafToken(e: XmlElement): CcsdsToken {
  if (e.name === 'COMMENT') return { kind: 'comment', line: e.line, text: e.text };
  const keyword = e.name === 'USER_DEFINED' ? `USER_DEFINED_${e.attributes.parameter ?? ''}` : e.name;
  if (!/^[A-Z][A-Z0-9_]*$/.test(keyword) || keyword === 'USER_DEFINED_') {
    throw new CcsdsFormatError('xml', e.line, `element <${e.name}> is not an ODM keyword`);
  }
  if (e.text === '') throw new CcsdsFormatError(keyword, e.line, `${keyword} has no value`);
  const unit = e.attributes.units;
  return unit === undefined
    ? { kind: 'keyword', line: e.line, keyword, value: e.text }
    : { kind: 'keyword', line: e.line, keyword, value: e.text, unit };
}

function stateVectorToken(e: XmlElement): CcsdsToken {
  const fields: string[] = [];
  e.children.forEach((child, i) => {
    const expected = STATE_FIELDS[i];
    if (!expected || child.name !== expected[0] || child.children.length > 0) {
      throw new CcsdsFormatError(child.name, child.line, `<stateVector> element ${i + 1} is <${child.name}>; expected `
        + `<${expected?.[0] ?? '/stateVector'}>`);
    }
    const unit = child.attributes.units;
    if (unit !== undefined && unit.toLowerCase() !== (expected[1] ?? '').toLowerCase()) {
      throw new CcsdsFormatError(child.name, child.line, `unit [${unit}] where the standard puts `
        + `${expected[1] ? `[${expected[1]}]` : 'no unit'}`);
    }
    fields.push(child.text);
  });
  if (fields.length !== 7 && fields.length !== 10) {
    throw new CcsdsFormatError('stateVector', e.line, `<stateVector> has ${fields.length} elements; expected EPOCH, `
      + 'X..Z_DOT and optionally X_DDOT..Z_DDOT');
  }
  return { kind: 'data', line: e.line, fields };
}
