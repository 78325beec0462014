/**
 * Brings a live DOM subtree in line with a freshly built one, changing only what differs.
 * Children are matched by `data-key` when present, else by position and tag. The element
 * that has focus keeps its value while the user is typing in it.
 */
const HANDLER_KEYS = ['onclick', 'onchange', 'oninput', 'onkeydown', 'onsubmit', 'ondragstart', 'ondragover', 'ondrop', 'ondragleave', 'onpointerdown', 'onpointerenter', 'onpointerleave', 'onfocus', 'onblur', 'ondblclick'] as const;

export function morph(live: Element, next: Element): void {
  morphAttributes(live, next);
  morphChildren(live, next);
}

function morphAttributes(live: Element, next: Element): void {
  for (const attr of Array.from(live.attributes)) if (!next.hasAttribute(attr.name)) live.removeAttribute(attr.name);
  for (const attr of Array.from(next.attributes)) if (live.getAttribute(attr.name) !== attr.value) live.setAttribute(attr.name, attr.value);
  const l = live as unknown as Record<string, unknown>;
  const n = next as unknown as Record<string, unknown>;
  for (const key of HANDLER_KEYS) if (l[key] !== n[key]) l[key] = n[key] ?? null;
  if (live instanceof HTMLInputElement || live instanceof HTMLTextAreaElement || live instanceof HTMLSelectElement) {
    const typing = document.activeElement === live;
    const nextValue = (next as HTMLInputElement).value;
    if (!typing && live.value !== nextValue) live.value = nextValue;
    if (live instanceof HTMLInputElement) live.checked = (next as HTMLInputElement).checked;
    live.disabled = (next as HTMLInputElement).disabled;
  }
  if (live instanceof HTMLOptionElement) live.selected = (next as HTMLOptionElement).selected;
}

function keyOf(node: Node): string | null {
  return node instanceof Element ? node.getAttribute('data-key') : null;
}

function sameKind(a: Node, b: Node): boolean {
  if (a.nodeType !== b.nodeType) return false;
  if (a instanceof Element && b instanceof Element) return a.tagName === b.tagName && keyOf(a) === keyOf(b);
  return true;
}

function morphChildren(live: Element, next: Element): void {
  const nextChildren = Array.from(next.childNodes);
  const keyed = new Map<string, Node>();
  for (const c of Array.from(live.childNodes)) {
    const k = keyOf(c);
    if (k !== null) keyed.set(k, c);
  }
  let cursor: ChildNode | null = live.firstChild;
  for (const wanted of nextChildren) {
    const k = keyOf(wanted);
    let match: Node | null = null;
    if (k !== null) {
      match = keyed.get(k) ?? null;
      if (match && !sameKind(match, wanted)) match = null;
    } else if (cursor && keyOf(cursor) === null && sameKind(cursor, wanted)) {
      match = cursor;
    }
    if (match) {
      if (match !== cursor) live.insertBefore(match, cursor);
      else cursor = cursor.nextSibling;
      if (match instanceof Element && wanted instanceof Element) morph(match, wanted);
      else if (match.nodeValue !== wanted.nodeValue) match.nodeValue = wanted.nodeValue;
    } else {
      live.insertBefore(wanted, cursor);
    }
  }
  while (cursor) {
    const after: ChildNode | null = cursor.nextSibling;
    cursor.remove();
    cursor = after;
  }
}
