/** A small well-formedness check for the SVG we write (tags balanced, attributes quoted, entities known). */
export function checkXml(text: string): { ok: true; elements: Map<string, number> } | { ok: false; error: string } {
  const elements = new Map<string, number>();
  const stack: string[] = [];
  const body = text.replace(/^<\?xml[^?]*\?>\s*/, "");
  const re = /<(\/?)([A-Za-z][\w:-]*)((?:\s+[\w:-]+="[^"<]*")*)\s*(\/?)>|<!--[\s\S]*?-->/g;
  let last = 0;
  for (let m = re.exec(body); m; m = re.exec(body)) {
    const between = body.slice(last, m.index);
    if (/[<>]/.test(between)) return { ok: false, error: `stray markup near offset ${last}: ${between.slice(0, 40)}` };
    if (/&(?!(amp|lt|gt|quot|apos|#\d+);)/.test(between)) return { ok: false, error: `bad entity near offset ${last}` };
    last = m.index + m[0].length;
    if (m[0].startsWith("<!--")) continue;
    const [, close, name, , selfClose] = m;
    if (close) {
      if (stack.pop() !== name) return { ok: false, error: `</${name}> does not close the open element` };
    } else {
      elements.set(name!, (elements.get(name!) ?? 0) + 1);
      if (!selfClose) stack.push(name!);
    }
  }
  if (body.slice(last).trim() !== "") return { ok: false, error: "text after the root element" };
  if (stack.length > 0) return { ok: false, error: `unclosed <${stack.at(-1)}>` };
  return { ok: true, elements };
}

/** Number of elements with a given class attribute. */
export function countClass(text: string, cls: string): number {
  return (text.match(new RegExp(`class="${cls}"`, "g")) ?? []).length;
}
