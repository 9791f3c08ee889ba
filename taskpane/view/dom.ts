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

/** A labelled text field: the element to place and a reader of its current text. */
export interface Field {
  readonly element: HTMLElement;
  readonly input: ValueElement;
  text(): string;
  set(text: string): void;
}

/**
 * A Fluent text field with a label and an optional hint below it. Cost O(1).
 * @example textField('plan-baseline', 'Baseline conversion rate (%)', '4') //=> { element, input, text(), set() }
 */
export function textField(id: string, label: string, value: string, hint?: string): Field {
  const input = el('fluent-text-input', { id, value, 'data-field': id }) as ValueElement;
  input.setAttribute('aria-label', label);
  const field = el(
    'fluent-field',
    { 'label-position': 'above' },
    el('label', { slot: 'label', for: id }, label),
    input,
  );
  if (hint) field.append(el('span', { slot: 'message', class: 'hint' }, hint));
  return {
    element: field,
    input,
    text: () => String(input.value ?? input.getAttribute('value') ?? ''),
    set: (text: string) => {
      input.value = text;
      input.setAttribute('value', text);
    },
  };
}

/**
 * A Fluent button. Cost O(1).
 * @example button('prior-write', 'Write to sheet', 'primary') //=> <fluent-button id="prior-write" appearance="primary">
 */
export function button(id: string, label: string, appearance: 'primary' | 'secondary' | 'subtle' = 'secondary'): HTMLElement {
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
  const bar = el('fluent-message-bar', { intent, layout: 'multiline', role: intent === 'error' ? 'alert' : 'status' }, text);
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
export function select(id: string, label: string, options: readonly [string, string][], chosen: string): { element: HTMLElement; input: HTMLSelectElement } {
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
