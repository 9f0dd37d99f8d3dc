/** A tiny SVG writer: escaping and element helpers shared by the drawings. */

export function esc(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/** An element with attributes (numbers rounded to 0.1) and optional text content. */
export function el(name: string, attrs: Record<string, string | number>, text?: string): string {
  const a = Object.entries(attrs)
    .map(([k, v]) => `${k}="${typeof v === "number" ? Math.round(v * 10) / 10 : esc(v)}"`)
    .join(" ");
  return text === undefined ? `<${name} ${a}/>` : `<${name} ${a}>${esc(text)}</${name}>`;
}

/** A whole SVG document. */
export function svgDocument(width: number, height: number, title: string, style: string, body: string[]): string {
  return [
    '<?xml version="1.0" encoding="UTF-8"?>',
    `<svg xmlns="http://www.w3.org/2000/svg" width="${Math.ceil(width)}" height="${Math.ceil(height)}" viewBox="0 0 ${Math.ceil(width)} ${Math.ceil(height)}">`,
    `<title>${esc(title)}</title>`,
    `<style>${style}</style>`,
    el("rect", { x: 0, y: 0, width: Math.ceil(width), height: Math.ceil(height), class: "paper" }),
    ...body,
    "</svg>",
    "",
  ].join("\n");
}
