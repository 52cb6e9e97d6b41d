/**
 * Small HTML helpers for the page tests: read our own EJS markup as a browser would, without
 * a DOM library (none is installed). They fit the markup our templates write (double-quoted
 * attributes), not HTML at large.
 */

/** Decode the few HTML entities EJS writes into text and attribute values. */
export function unescapeHtml(s: string): string {
  return s.replace(/&#34;/g, '"').replace(/&#39;/g, "'").replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&');
}

/** The value of attribute `name` in an opening tag, decoded; undefined when the tag has none. */
function attr(tag: string, name: string): string | undefined {
  const m = new RegExp(`\\s${name.replace(/[.]/g, '\\.')}="([^"]*)"`).exec(tag);
  return m ? unescapeHtml(m[1]) : undefined;
}

/** Input types a browser does not submit as a plain name=value pair from the form's state. */
const NOT_POSTED = new Set(['file', 'submit', 'button', 'image', 'reset']);

/**
 * The fields a browser would post from the form `<form id="formId">` in `html`: text-like
 * inputs, checked radios and boxes, each select's selected option (else its first), and
 * textareas. File inputs and buttons are left out. Throws when the page has no such form.
 */
export function formFields(html: string, formId: string): Record<string, string> {
  const start = html.indexOf(`<form id="${formId}"`);
  if (start < 0) throw new Error(`no form #${formId} on the page`);
  const form = html.slice(start, html.indexOf('</form>', start));
  const out: Record<string, string> = {};
  for (const m of form.matchAll(/<input\b[^>]*>/g)) {
    const tag = m[0];
    const name = attr(tag, 'name');
    if (!name) continue;
    const type = attr(tag, 'type') ?? 'text';
    if (NOT_POSTED.has(type)) continue;
    if ((type === 'radio' || type === 'checkbox') && !/\schecked\b/.test(tag)) continue;
    out[name] = attr(tag, 'value') ?? '';
  }
  for (const m of form.matchAll(/<select\b([^>]*)>([\s\S]*?)<\/select>/g)) {
    const name = attr(m[1], 'name');
    if (!name) continue;
    const options = [...m[2].matchAll(/<option\b([^>]*)>/g)].map((o) => ({ value: attr(o[1], 'value') ?? '', selected: /\sselected\b/.test(o[1]) }));
    out[name] = (options.find((o) => o.selected) ?? options[0])?.value ?? '';
  }
  for (const m of form.matchAll(/<textarea\b([^>]*)>([\s\S]*?)<\/textarea>/g)) {
    const name = attr(m[1], 'name');
    if (name) out[name] = unescapeHtml(m[2]);
  }
  return out;
}
