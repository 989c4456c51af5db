/** Tiny DOM builders: `h('button', { type: 'button', onclick }, 'Text')` and `svg('circle', {...})`. */

export type Child = Node | string | number | null | undefined | false | Child[];
export type Attrs = Record<string, string | number | boolean | null | undefined | ((event: Event) => void)>;

function append(parent: Node, children: Child[]): void {
  for (const c of children) {
    if (c === null || c === undefined || c === false) continue;
    if (Array.isArray(c)) append(parent, c);
    else parent.appendChild(typeof c === 'string' || typeof c === 'number' ? document.createTextNode(String(c)) : c);
  }
}

function setAttrs(el: Element, attrs: Attrs): void {
  for (const [key, value] of Object.entries(attrs)) {
    if (value === undefined || value === null || value === false) continue;
    if (typeof value === 'function') {
      el.addEventListener(key.replace(/^on/, ''), value);
    } else if (value === true) {
      el.setAttribute(key, '');
    } else {
      el.setAttribute(key, String(value));
    }
  }
}

/** An HTML element with attributes (functions under `on…` keys become listeners) and children. */
export function h<K extends keyof HTMLElementTagNameMap>(tag: K, attrs: Attrs = {}, ...children: Child[]): HTMLElementTagNameMap[K] {
  const el = document.createElement(tag);
  setAttrs(el, attrs);
  append(el, children);
  return el;
}

const SVG_NS = 'http://www.w3.org/2000/svg';

/** An SVG element (numbers are written with 2 decimals at most to keep the markup small). */
export function svg<K extends keyof SVGElementTagNameMap>(tag: K, attrs: Record<string, string | number | undefined> = {}, ...children: Child[]): SVGElementTagNameMap[K] {
  const el = document.createElementNS(SVG_NS, tag);
  for (const [key, value] of Object.entries(attrs)) {
    if (value === undefined) continue;
    el.setAttribute(key, typeof value === 'number' ? String(Math.round(value * 100) / 100) : value);
  }
  append(el, children);
  return el;
}

/** Replaces every child of `el`. */
export function replaceChildren(el: Element, ...children: Child[]): void {
  el.textContent = '';
  append(el, children);
}

let idCounter = 0;
/** A document-unique id with a readable prefix. */
export function uid(prefix: string): string {
  idCounter += 1;
  return `${prefix}-${idCounter}`;
}

/**
 * A data table in a region that scrolls sideways when the table is wider than its panel, so no column is ever
 * cut off or pushes the page wider; focusable and named, so keyboard users can scroll it too.
 */
export function scrollingTable(label: string, table: HTMLTableElement): HTMLDivElement {
  return h('div', { class: 'table-scroll', role: 'region', 'aria-label': label, tabindex: '0' }, table);
}
