import '../../shared/schemas/error-map';
import { cleanup, configure } from '@testing-library/react';
import { afterEach } from 'vitest';

afterEach(() => cleanup());

// findBy… and waitFor return as soon as what they look for is there; on a loaded 2-core machine a save, a navigation
// and a render can take longer than the default second to get there. Not a sleep: a passing test waits no longer.
configure({ asyncUtilTimeout: 10_000 });

/*
 * jsdom finds a label's control and an input's labels by walking the whole document: `input.labels` visits every
 * node and asks each label for its control, and `label.control` walks the document again looking for the `for` id.
 * Testing Library reads `labels` for every element a label query looks at, so one getByLabelText on the estimate
 * editor (a few thousand nodes, about a hundred labels) took about half a second, and a test of a few queries ran
 * past five seconds on a busy machine. These are the same lookups by the HTML standard's rules, with the document's
 * id index instead of a walk: the first element with the id (getElementById's answer), if it is labelable; else the
 * first labelable descendant; and an element's labels are the labels whose control it is, in document order.
 */
const LABELABLE_TAGS = new Set(['BUTTON', 'METER', 'OUTPUT', 'PROGRESS', 'SELECT', 'TEXTAREA']);

function isLabelable(el: Element): boolean {
  return LABELABLE_TAGS.has(el.tagName) || (el.tagName === 'INPUT' && (el.getAttribute('type') ?? '').toLowerCase() !== 'hidden');
}

/** The first labelable descendant, in document order. */
function firstLabelable(root: Element): HTMLElement | null {
  const walker = root.ownerDocument.createTreeWalker(root, NodeFilter.SHOW_ELEMENT);
  for (let node = walker.nextNode(); node; node = walker.nextNode()) if (isLabelable(node as Element)) return node as HTMLElement;
  return null;
}

Object.defineProperty(HTMLLabelElement.prototype, 'control', {
  configurable: true,
  get(this: HTMLLabelElement): HTMLElement | null {
    const id = this.getAttribute('for');
    if (id !== null) {
      if (id === '') return null;
      const root = this.getRootNode() as Document | ShadowRoot | Element;
      const found = 'getElementById' in root ? root.getElementById(id) : root.querySelector(`[id="${id.replace(/["\\]/g, "\\$&")}"]`);
      return found && isLabelable(found) ? (found as HTMLElement) : null;
    }
    return firstLabelable(this);
  },
});

for (const ctor of [HTMLInputElement, HTMLButtonElement, HTMLSelectElement, HTMLTextAreaElement, HTMLOutputElement, HTMLMeterElement, HTMLProgressElement]) {
  Object.defineProperty(ctor.prototype, 'labels', {
    configurable: true,
    get(this: HTMLElement): HTMLLabelElement[] | null {
      if (!isLabelable(this)) return null;
      const root = this.getRootNode() as Document | Element;
      // A static list: indexing jsdom's live HTMLCollection goes through a proxy that looks each index up by name.
      return Array.from(root.querySelectorAll('label')).filter((label) => label.control === this);
    },
  });
}
