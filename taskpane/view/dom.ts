/**
 * Small DOM helpers for the side panel's views: building elements, Fluent UI fields and message bars.
 * The Fluent UI web components are registered by index.ts before any view is built.
 */

type Attributes = Record<string, string | boolean | undefined>;

/**
 * Create an element with attributes and children. Boolean true sets an empty attribute, false or
 * undefined leaves it out. Cost O(children).
 * @example el('p', { class: 'hint' }, 'text') //=> <p class="hint">text</p>
 */
export function el<K extends string>(tag: K, attributes: Attributes = {}, ...children: (Node | string)[]): HTMLElement {
  const node = document.createElement(tag);
  for (const [name, value] of Object.entries(attributes)) {
    if (value === true) node.setAttribute(name, '');
    else if (typeof value === 'string') node.setAttribute(name, value);
  }
  for (const child of children) node.append(child);
  return node;
}

/** A Fluent element with a string value (text input, dropdown). */
export type ValueElement = HTMLElement & { value: string };

/** A labelled text field: the element to place, a reader of its current text, and a line for its message. */
export interface Field {
  readonly element: HTMLElement;
  readonly input: ValueElement;
  text(): string;
  set(text: string): void;
  /** Show an error (red) or a note (how the value was read) under the field, or clear it with null. */
  say(kind: 'error' | 'note', text: string | null): void;
}

/** Options of a text field. */
export interface FieldOptions {
  /** A hint below the label. */
  readonly hint?: string;
  /** A unit shown inside the field after the value ("%"): the field takes percents. */
  readonly unit?: string;
}

/**
 * A Fluent text field with a label, an optional unit inside it ("%") and hint below it, and a line for
 * messages about what was typed. Cost O(1).
 * @example textField('plan-baseline', 'Baseline conversion rate', '4', { unit: '%' }) //=> { element, input, text(), set(), say() }
 */
export function textField(id: string, label: string, value: string, options: FieldOptions | string = {}): Field {
  const { hint, unit } = typeof options === 'string' ? { hint: options, unit: undefined } : options;
  const input = el('fluent-text-input', {
    id,
    value,
    slot: 'input',
    'data-field': id,
    ...(unit ? { 'data-unit': unit } : {}),
  }) as ValueElement;
  input.setAttribute('aria-label', unit === '%' ? `${label}, in percent` : label);
  if (unit) input.append(el('span', { slot: 'end', class: 'unit', 'aria-hidden': 'true' }, unit));
  const field = el(
    'fluent-field',
    { 'label-position': 'above' },
    el('label', { slot: 'label', for: id }, label),
    input,
  );
  const wrapper = el('div', { class: 'field' }, field);
  if (hint) wrapper.append(el('p', { class: 'hint field-hint' }, hint));
  const message = el('p', { id: `${id}-message`, class: 'field-message', 'aria-live': 'polite', hidden: true });
  wrapper.append(message);
  return {
    element: wrapper,
    input,
    text: () => String(input.value ?? input.getAttribute('value') ?? ''),
    set: (text: string) => {
      input.value = text;
      input.setAttribute('value', text);
    },
    say: (kind, text) => {
      message.hidden = text === null;
      message.textContent = text ?? '';
      message.className = `field-message ${kind === 'error' ? 'error-text' : 'hint'}`;
      if (kind === 'error' && text !== null) input.setAttribute('data-invalid', '');
      else input.removeAttribute('data-invalid');
    },
  };
}

/**
 * A Fluent radio group whose radios carry visible labels (each radio in a field, label after it).
 * The first option is checked. Read the choice from the group's `value`. Cost O(options).
 * @example radioGroup('prior-mode', 'How to choose', [['mean', 'From a typical rate', 'prior-mode-mean']])
 */
export function radioGroup(
  id: string,
  label: string,
  options: readonly [value: string, text: string, radioId: string][],
  orientation: 'vertical' | 'horizontal' = 'vertical',
): ValueElement {
  const group = el('fluent-radio-group', { id, orientation, name: id, 'aria-label': label }) as ValueElement;
  options.forEach(([value, text, radioId], i) => {
    group.append(
      el(
        'fluent-field',
        { 'label-position': 'after' },
        el('label', { slot: 'label', for: radioId }, text),
        el('fluent-radio', { slot: 'input', id: radioId, value, ...(i === 0 ? { checked: true } : {}) }),
      ),
    );
  });
  return group;
}

/** A Fluent checkbox with a visible label; `checked` reads its state. */
export interface Check {
  readonly element: HTMLElement;
  readonly box: HTMLElement;
  checked(): boolean;
}

/**
 * A Fluent checkbox with its label after it. Cost O(1).
 * @example checkbox('plan-use-prior', 'Plan with the prior', false).checked() //=> false
 */
export function checkbox(id: string, label: string, checked: boolean): Check {
  const box = el('fluent-checkbox', { id, slot: 'input', ...(checked ? { checked: true } : {}) });
  const field = el(
    'fluent-field',
    { 'label-position': 'after', class: 'check' },
    el('label', { slot: 'label', for: id }, label),
    box,
  );
  return { element: field, box, checked: () => (box as HTMLElement & { checked?: boolean }).checked === true };
}

/**
 * A Fluent button. Cost O(1).
 * @example button('prior-write', 'Write to sheet', 'primary') //=> <fluent-button id="prior-write" appearance="primary">
 */
export function button(
  id: string,
  label: string,
  appearance: 'primary' | 'secondary' | 'subtle' = 'secondary',
): HTMLElement {
  return el('fluent-button', { id, appearance, type: 'button' }, label);
}

/** Enable or disable a Fluent button. */
export function setBusy(control: HTMLElement, busy: boolean): void {
  if (busy) control.setAttribute('disabled', '');
  else control.removeAttribute('disabled');
}

/** The intent of a message shown to the user. */
export type Intent = 'info' | 'success' | 'warning' | 'error';

/**
 * Replace the contents of a status area with a Fluent message bar (or clear it for null). Cost O(1).
 * @example showMessage(area, 'warning', 'The prior is strong') // area now holds one message bar
 */
export function showMessage(area: HTMLElement, intent: Intent, text: string | null, ...actions: HTMLElement[]): void {
  area.replaceChildren();
  if (text === null) return;
  const bar = el(
    'fluent-message-bar',
    { intent, layout: 'multiline', role: intent === 'error' ? 'alert' : 'status' },
    text,
  );
  for (const action of actions) {
    action.setAttribute('slot', 'actions');
    bar.append(action);
  }
  area.append(bar);
}

/**
 * A native select styled to sit beside Fluent fields (used for column mappings). Cost O(options).
 * @example select('map-visitors', 'Visitors column', [['1','B']], '1')
 */
export function select(
  id: string,
  label: string,
  options: readonly [string, string][],
  chosen: string,
): { element: HTMLElement; input: HTMLSelectElement } {
  const input = el('select', { id, class: 'native-select' }) as HTMLSelectElement;
  for (const [value, text] of options) {
    const option = el('option', { value }, text) as HTMLOptionElement;
    if (value === chosen) option.selected = true;
    input.append(option);
  }
  const wrapper = el('div', { class: 'select-field' }, el('label', { for: id }, label), input);
  return { element: wrapper, input };
}

/** A zero-delay pause so the page can repaint between steps of a long computation. */
export function nextFrame(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}

/**
 * A number with at most six significant digits and no trailing zeros, for showing prior parameters.
 * Cost O(1).
 * @example shortNumber(8) //=> "8"; shortNumber(191.99999) //=> "192"; shortNumber(0.0123456789) //=> "0.0123457"
 */
export function shortNumber(x: number): string {
  return String(Number(x.toPrecision(6)));
}
