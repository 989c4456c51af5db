/**
 * Writers build a message once as a list of items, then render it as KVN (502.0-B section 7) or XML
 * (section 8). Containers become KVN block delimiters only where the KVN has them (OEM metadata and
 * covariance).
 */
import { COVARIANCE_KEYWORDS, covarianceUnit } from '../messages/covariance.ts';
import type { BlockName } from './tokens.ts';

export type Item =
  | { kind: 'keyword'; keyword: string; value: string; unit?: string }
  | { kind: 'comment'; text: string }
  | { kind: 'open'; name: string; kvn?: BlockName }
  | { kind: 'close'; name: string; kvn?: BlockName }
  /** An OEM ephemeris line: field names are the XML element names. */
  | { kind: 'state'; names: readonly string[]; units: readonly (string | undefined)[]; fields: string[] }
  /** 21 lower-triangle values: keywords in an OPM (KVN and XML) and OEM XML, rows in OEM KVN. */
  | { kind: 'covariance'; values: string[]; rows: boolean }
  | { kind: 'blank' };

const ASCII_FOR: Readonly<Record<string, string>> = {
  'Δ': 'D', 'σ': 'sigma', '·': '.', '×': 'x', '≤': '<=', '≥': '>=', '−': '-', '–': '-', '—': '-', '²': '2', '³': '3',
  'µ': 'u', 'μ': 'u', '°': ' deg', '’': "'", '‘': "'", '“': '"', '”': '"', '…': '...',
};

/** The messages are ASCII (502.0-B 7.2): common symbols are spelled out, anything else becomes '?'. */
export function asciiText(text: string): string {
  return text.replace(/[^\t\x20-\x7e]/g, (c) => ASCII_FOR[c] ?? '?').replace(/\t/g, ' ');
}

/** Longest keyword written, for aligned `=` signs as in the standard's examples. */
const KEYWORD_WIDTH = 20;

/** Comment text per KVN line: well inside the 254-character line limit. */
const COMMENT_WIDTH = 120;

/** Splits text at spaces into pieces of at most `width` characters (a longer word is cut). */
export function wrap(text: string, width: number): string[] {
  const out: string[] = [];
  let rest = text.trim();
  while (rest.length > width) {
    const cut = rest.lastIndexOf(' ', width);
    const at = cut > 0 ? cut : width;
    out.push(rest.slice(0, at).trimEnd());
    rest = rest.slice(at).trimStart();
  }
  out.push(rest);
  return out;
}

/** Renders items as KVN text (lines end in LF). */
export function renderKvn(items: readonly Item[]): string {
  const lines: string[] = [];
  for (const item of items) {
    switch (item.kind) {
      case 'keyword':
        lines.push(`${item.keyword.padEnd(KEYWORD_WIDTH)} = ${asciiText(item.value)}${item.unit ? ` [${item.unit}]` : ''}`);
        break;
      case 'comment': for (const part of wrap(asciiText(item.text), COMMENT_WIDTH)) lines.push(`COMMENT ${part}`.trimEnd()); break;
      case 'open': case 'close': if (item.kvn) lines.push(item.kvn); break;
      case 'state': lines.push(item.fields.join(' ')); break;
      case 'covariance':
        if (item.rows) {
          let k = 0;
          for (let i = 0; i < 6; i++) {
            lines.push(item.values.slice(k, k + i + 1).join(' '));
            k += i + 1;
          }
        } else {
          let k = 0;
          for (let i = 0; i < 6; i++) {
            for (let j = 0; j <= i; j++, k++) {
              lines.push(`${COVARIANCE_KEYWORDS[k].padEnd(KEYWORD_WIDTH)} = ${item.values[k]} [${covarianceUnit(i, j)}]`);
            }
          }
        }
        break;
      case 'blank': lines.push(''); break;
    }
  }
  return lines.join('\n') + '\n';
}

function escapeXml(text: string): string {
  return asciiText(text).replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** Renders items as an NDM/XML document whose root is `<opm>` or `<oem>` with the version attribute. */
export function renderXml(root: 'opm' | 'oem', version: string, items: readonly Item[]): string {
  // Schema location as published on the SANA registry for NDM/XML 1.0 (from memory).
  const lines = ['<?xml version="1.0" encoding="UTF-8"?>',
    `<${root} xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance" `
    + `xsi:noNamespaceSchemaLocation="http://sanaregistry.org/r/ndmxml/ndmxml-1.0-master.xsd" `
    + `id="CCSDS_${root.toUpperCase()}_VERS" version="${escapeXml(version)}">`];
  let depth = 1;
  const pad = (): string => '  '.repeat(depth);
  const leaf = (name: string, value: string, unit?: string): string =>
    `${pad()}<${name}${unit ? ` units="${escapeXml(unit)}"` : ''}>${escapeXml(value)}</${name}>`;
  for (const item of items) {
    switch (item.kind) {
      case 'keyword':
        if (item.keyword.startsWith('USER_DEFINED_')) {
          lines.push(`${pad()}<USER_DEFINED parameter="${escapeXml(item.keyword.slice(13))}">${escapeXml(item.value)}</USER_DEFINED>`);
        } else {
          lines.push(leaf(item.keyword, item.value, item.unit));
        }
        break;
      case 'comment': lines.push(leaf('COMMENT', item.text)); break;
      // An empty name marks a KVN-only delimiter (the OEM's one COVARIANCE_START around all matrices).
      case 'open': if (item.name) { lines.push(`${pad()}<${item.name}>`); depth++; } break;
      case 'close': if (item.name) { depth--; lines.push(`${pad()}</${item.name}>`); } break;
      case 'state':
        lines.push(`${pad()}<stateVector>`);
        depth++;
        item.fields.forEach((f, i) => lines.push(leaf(item.names[i], f, item.units[i])));
        depth--;
        lines.push(`${pad()}</stateVector>`);
        break;
      case 'covariance': {
        let k = 0;
        for (let i = 0; i < 6; i++) for (let j = 0; j <= i; j++, k++) {
          lines.push(leaf(COVARIANCE_KEYWORDS[k], item.values[k], covarianceUnit(i, j)));
        }
        break;
      }
      case 'blank': break;
    }
  }
  lines.push(`</${root}>`);
  return lines.join('\n') + '\n';
}
