/** Escapes text for HTML element content and double- or single-quoted attribute values. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => (c === '&' ? '&amp;' : c === '<' ? '&lt;' : c === '>' ? '&gt;' : c === '"' ? '&quot;' : '&#39;'));
}

/** Markup that is already safe (built by `html` or rendered by Vega); inserted as is. */
export class SafeHtml {
  constructor(readonly value: string) {}
  toString(): string {
    return this.value;
  }
}

type Interpolated = SafeHtml | string | number | null | undefined | false | readonly Interpolated[];

/** Template tag that escapes every interpolated value unless it is SafeHtml; arrays are joined, null/false dropped. */
export function html(strings: TemplateStringsArray, ...values: Interpolated[]): SafeHtml {
  let out = strings[0]!;
  for (let i = 0; i < values.length; i++) out += render(values[i]) + strings[i + 1]!;
  return new SafeHtml(out);
}

/** Marks trusted markup (our own SVG from Vega, our own constants) as safe. */
export function trusted(markup: string): SafeHtml {
  return new SafeHtml(markup);
}

function render(v: Interpolated): string {
  if (v === null || v === undefined || v === false) return '';
  if (v instanceof SafeHtml) return v.value;
  if (Array.isArray(v)) return v.map(render).join('');
  return escapeHtml(String(v));
}
