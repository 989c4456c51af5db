/**
 * Labelled form controls keyed by problem path (`burns[0].epoch`), with an error slot beside each, so zod
 * and server issues land next to the field they name (or, failing that, next to the nearest enclosing group).
 */
import { h, type Child } from '../dom.ts';
import type { FieldIssue } from '../api-client.ts';

interface Slot { control: HTMLElement | null; error: HTMLElement; label: string }

export class FieldRegistry {
  private readonly slots = new Map<string, Slot>();
  private readonly inputs = new Map<string, HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement>();

  static idOf(path: string): string {
    return `pf-${path.replace(/[^A-Za-z0-9]+/g, '-').replace(/-$/, '')}`;
  }

  /** A text or number input (numbers stay text so a typo reaches zod as a string and is reported). */
  input(path: string, label: string, opts: { unit?: string; help?: string; value?: string; inputmode?: string; wide?: boolean } = {}): HTMLElement {
    const id = FieldRegistry.idOf(path);
    const input = h('input', {
      id, name: path, type: 'text', value: opts.value ?? '', spellcheck: 'false', autocomplete: 'off',
      ...(opts.inputmode ? { inputmode: opts.inputmode } : {}),
      'aria-describedby': [opts.help ? `${id}-help` : '', `${id}-error`].filter(Boolean).join(' '),
    });
    this.inputs.set(path, input);
    return this.wrap(path, id, label, input, opts.unit, opts.help, opts.wide);
  }

  select(path: string, label: string, options: readonly string[], value?: string, help?: string): HTMLElement {
    const id = FieldRegistry.idOf(path);
    const select = h('select', { id, name: path, 'aria-describedby': [help ? `${id}-help` : '', `${id}-error`].filter(Boolean).join(' ') },
      options.map((o) => h('option', { value: o, ...(o === value ? { selected: true } : {}) }, o)));
    this.inputs.set(path, select);
    return this.wrap(path, id, label, select, undefined, help);
  }

  /** Three inputs (x, y, z or R, T, N…) under one legend; issues on the vector itself go to its slot. */
  vector(path: string, legend: string, axes: readonly [string, string, string], unit: string, values?: readonly (number | string)[]): HTMLElement {
    const id = FieldRegistry.idOf(path);
    const error = h('p', { id: `${id}-error`, class: 'field-error', 'aria-live': 'polite' });
    const fieldset = h('fieldset', { class: 'vector', id, 'aria-describedby': `${id}-error` },
      h('legend', {}, `${legend} (${unit})`),
      h('div', { class: 'vector-row' }, axes.map((axis, i) => this.input(`${path}[${i}]`, axis, { value: values?.[i] !== undefined ? String(values[i]) : '', inputmode: 'decimal' }))),
      error);
    this.slots.set(path, { control: fieldset, error, label: legend });
    return fieldset;
  }

  /** A group (fieldset) that can hold issues about a whole object or array. */
  group(path: string, legend: string, ...children: Child[]): HTMLElement {
    const id = FieldRegistry.idOf(path);
    const error = h('p', { id: `${id}-error`, class: 'field-error', 'aria-live': 'polite' });
    const fieldset = h('fieldset', { class: 'group', id }, h('legend', {}, legend), children, error);
    this.slots.set(path, { control: fieldset, error, label: legend });
    return fieldset;
  }

  private wrap(path: string, id: string, label: string, control: HTMLElement, unit?: string, help?: string, wide?: boolean): HTMLElement {
    const error = h('p', { id: `${id}-error`, class: 'field-error', 'aria-live': 'polite' });
    this.slots.set(path, { control, error, label });
    return h('div', { class: wide ? 'field wide' : 'field' },
      h('label', { for: id }, label, unit ? h('span', { class: 'unit' }, ` (${unit})`) : null),
      control,
      help ? h('p', { id: `${id}-help`, class: 'help' }, help) : null,
      error);
  }

  value(path: string): string {
    return this.inputs.get(path)?.value.trim() ?? '';
  }

  /** Number when the text is one, the text itself otherwise (zod then names the field), undefined when empty. */
  number(path: string): number | string | undefined {
    const v = this.value(path);
    if (v === '') return undefined;
    const n = Number(v);
    return Number.isFinite(n) ? n : v;
  }

  vec(path: string): (number | string | undefined)[] {
    return [0, 1, 2].map((i) => this.number(`${path}[${i}]`));
  }

  set(path: string, value: string | number | undefined): void {
    const el = this.inputs.get(path);
    if (el && value !== undefined) el.value = String(value);
  }

  clear(): void {
    for (const slot of this.slots.values()) {
      slot.error.textContent = '';
      slot.control?.removeAttribute('aria-invalid');
    }
  }

  /** Shows each issue beside its field (or nearest enclosing group); returns the issues that found no slot. */
  show(issues: FieldIssue[]): { placed: { issue: FieldIssue; id: string; label: string }[]; unplaced: FieldIssue[] } {
    this.clear();
    const placed: { issue: FieldIssue; id: string; label: string }[] = [];
    const unplaced: FieldIssue[] = [];
    for (const issue of issues) {
      let path = issue.path;
      let slot = this.slots.get(path);
      while (!slot && /[.[]/.test(path)) {
        path = path.replace(/(\.[^.[]+|\[\d+\])$/, '');
        slot = this.slots.get(path);
      }
      if (!slot) { unplaced.push(issue); continue; }
      slot.error.textContent = slot.error.textContent ? `${slot.error.textContent} ${issue.message}` : issue.message;
      slot.control?.setAttribute('aria-invalid', 'true');
      placed.push({ issue, id: slot.control?.id ?? '', label: slot.label });
    }
    return { placed, unplaced };
  }
}
