/**
 * Building DOM trees from plain calls: h('button', { onclick, 'aria-label': … }, 'Undo').
 * Views are functions of the state that return fresh trees; `morph` then brings the live
 * DOM in line with them, so that focus and typing survive a redraw.
 */
export type Child = Node | string | number | null | undefined | false | Child[];
export type Props = Record<string, unknown>;

export function h<K extends keyof HTMLElementTagNameMap>(tag: K, props?: Props | null, ...children: Child[]): HTMLElementTagNameMap[K] {
  const el = document.createElement(tag);
  if (props) applyProps(el, props);
  append(el, children);
  return el;
}

export function svg(tag: string, props?: Props | null, ...children: Child[]): SVGElement {
  const el = document.createElementNS('http://www.w3.org/2000/svg', tag);
  if (props) for (const [k, v] of Object.entries(props)) if (v !== undefined && v !== null && v !== false) el.setAttribute(k, String(v));
  append(el, children);
  return el;
}

function append(el: Element, children: Child[]): void {
  for (const c of children) {
    if (c === null || c === undefined || c === false) continue;
    if (Array.isArray(c)) append(el, c);
    else el.append(c instanceof Node ? c : String(c));
  }
}

/**
 * Event handlers (`on…`) are stored as properties so that `morph` can carry them over;
 * `value`, `checked`, `disabled`, `selected` are properties too; everything else is an attribute.
 */
function applyProps(el: HTMLElement, props: Props): void {
  for (const [key, value] of Object.entries(props)) {
    if (value === undefined || value === null || value === false) continue;
    if (key.startsWith('on') && typeof value === 'function') {
      (el as unknown as Record<string, unknown>)[key] = value;
    } else if (key === 'value' || key === 'checked' || key === 'selected' || key === 'disabled') {
      (el as unknown as Record<string, unknown>)[key] = value;
      if (key !== 'value') el.setAttribute(key, '');
      else el.setAttribute('value', String(value));
    } else if (key === 'style' && typeof value === 'object') {
      Object.assign(el.style, value);
    } else if (value === true) {
      el.setAttribute(key, '');
    } else {
      el.setAttribute(key, String(value));
    }
  }
}
