/**
 * Free text from people (names, labels, reasons, comments): what the doors accept, and how clients show
 * text that came from a server. Control characters (C0, DEL, C1: ESC sequences, carriage return, backspace)
 * can rewrite what a terminal shows, and bidirectional controls can reorder it on any screen, so both are
 * refused at the door; text that must be given needs at least one visible character (a lone zero-width
 * space is not a comment). Character classes are Unicode general categories (Unicode Standard §4.5).
 */
import * as z from 'zod';

/** Cc (C0, DEL, C1) except tab and line feed, line/paragraph separators, and the bidirectional controls
 * (embeddings, overrides, isolates, marks: Unicode Standard Annex #9). */
const REFUSED_IN_MULTILINE = /[\u0000-\u0008\u000B-\u001F\u007F-\u009F\u2028\u2029\u061C\u200E\u200F\u202A-\u202E\u2066-\u2069]/u;
/** The same plus tab and line feed: names and labels are one line. */
const REFUSED_IN_LINE = /[\u0000-\u001F\u007F-\u009F\u2028\u2029\u061C\u200E\u200F\u202A-\u202E\u2066-\u2069]/u;
/** A character a reader sees: a letter, mark, digit, punctuation or symbol. */
const VISIBLE = /[\p{L}\p{M}\p{N}\p{P}\p{S}]/u;

function describeRefused(text: string, refused: RegExp): string {
  const index = text.search(refused);
  const code = text.codePointAt(index) ?? 0;
  return `contains the control character U+${code.toString(16).toUpperCase().padStart(4, '0')} at position ${index + 1}; `
    + 'control and bidirectional-override characters are not accepted';
}

export interface FreeTextOptions {
  /** Longest accepted text, characters. */
  max: number;
  /** Shortest accepted text after trimming, characters. @defaultValue 0 */
  min?: number;
  /** Allow line feeds and tabs (reasons, comments). @defaultValue false */
  multiline?: boolean;
  /** Must contain at least one visible character (when non-empty). @defaultValue false */
  visible?: boolean;
  /** Trim surrounding white space first (where the field always did). @defaultValue false */
  trim?: boolean;
}

/**
 * A zod string for free text: length-checked (after trimming, when asked), control characters refused (naming the character and
 * its position), and when `visible`, a non-empty value needs a visible character.
 */
export function freeTextSchema(opts: FreeTextOptions) {
  const refused = opts.multiline ? REFUSED_IN_MULTILINE : REFUSED_IN_LINE;
  let schema = opts.trim ? z.string().trim().max(opts.max) : z.string().max(opts.max);
  if (opts.min) schema = schema.min(opts.min);
  return schema.superRefine((text, ctx) => {
    if (refused.test(text)) ctx.addIssue({ code: 'custom', message: describeRefused(text, refused) });
    else if (opts.visible && text !== '' && !VISIBLE.test(text)) {
      ctx.addIssue({ code: 'custom', message: 'has no visible character (letters, digits, punctuation or symbols)' });
    }
  });
}

/** True when `text` has at least one visible character. */
export function hasVisibleText(text: string): boolean {
  return VISIBLE.test(text);
}

/** Every character a client must not pass to a terminal or screen as is (including tab and line feed). */
const NON_PRINTABLE = /[\u0000-\u001F\u007F-\u009F\u2028\u2029\u061C\u200E\u200F\u202A-\u202E\u2066-\u2069]/gu;

/**
 * Text from a server made safe to print: each control or bidirectional character becomes a visible escape
 * `\u{1b}` (so nothing is silently dropped). With `keepLines`, line feeds (and tabs) are kept.
 */
export function printableText(text: string, opts: { keepLines?: boolean } = {}): string {
  return text.replace(NON_PRINTABLE, (ch) => {
    if (opts.keepLines && (ch === '\n' || ch === '\t')) return ch;
    return `\\u{${(ch.codePointAt(0) ?? 0).toString(16)}}`;
  });
}

/** Deep copy of parsed JSON with every string passed through printableText (keys included). */
export function printableJson<T>(value: T): T {
  if (typeof value === 'string') return printableText(value) as T;
  if (Array.isArray(value)) return value.map((v) => printableJson(v)) as T;
  if (value !== null && typeof value === 'object') {
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [printableText(k), printableJson(v)])) as T;
  }
  return value;
}
