/**
 * The HTML shell of the report: escaping, small table helpers and the inline style sheet. The page
 * is self-contained (no external script, style, font or image) and is written as well-formed
 * markup (every element closed, attributes quoted, only XML's predefined entities), so it also
 * parses as XML.
 */
import { FONT, GRID, HAIRLINE, INK, MUTED, PAPER } from './theme.js';

/** Escape text for HTML element content and attribute values. */
export function escapeHtml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

/** A table from a header row and body rows (cells are escaped text). */
export function htmlTable(header: readonly string[], body: readonly (readonly string[])[], className = 'data'): string {
  const head = `<tr>${header.map((h) => `<th>${escapeHtml(h)}</th>`).join('')}</tr>`;
  const rows = body.map((r) => `<tr>${r.map((c) => `<td>${escapeHtml(c)}</td>`).join('')}</tr>`).join('\n');
  return `<table class="${className}"><thead>${head}</thead><tbody>${rows}</tbody></table>`;
}

/** A figure holding one inline SVG picture and its caption. */
export function htmlFigure(kind: string, svg: string, caption: string, extraAttrs: Readonly<Record<string, string>> = {}): string {
  const attrs = Object.entries(extraAttrs).map(([k, v]) => ` data-${k}="${escapeHtml(v)}"`).join('');
  // the XML declaration vega writes (if any) is not allowed inside an HTML document
  const body = svg.replace(/^<\?xml[^>]*>\s*/, '');
  return `<figure class="plot" data-plot="${escapeHtml(kind)}"${attrs}>\n${body}\n<figcaption>${escapeHtml(caption)}</figcaption>\n</figure>`;
}

/** The inline style sheet. */
export const REPORT_CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
body { margin: 0; background: #f4f5f7; color: ${INK}; font-family: ${FONT}; font-size: 14px; line-height: 1.5; }
main { max-width: 1240px; margin: 0 auto; padding: 28px 28px 60px; }
header.top { border-left: 4px solid #0072B2; padding: 4px 0 4px 16px; margin-bottom: 26px; }
h1 { font-size: 22px; font-weight: 650; margin: 0 0 2px; letter-spacing: -0.01em; }
h2 { font-size: 17px; font-weight: 650; margin: 0 0 14px; color: ${INK}; }
h2::before { content: ''; display: inline-block; width: 10px; height: 10px; border-radius: 2px; background: #0072B2; margin-right: 9px; vertical-align: 1px; }
h3 { font-size: 14px; font-weight: 600; margin: 18px 0 8px; }
p.lead, p.meta { color: ${MUTED}; margin: 2px 0; }
section.card { background: ${PAPER}; border: 1px solid ${GRID}; border-radius: 6px; padding: 18px 20px; margin-bottom: 16px; }
.cols { display: grid; grid-template-columns: repeat(auto-fit, minmax(340px, 1fr)); gap: 16px; }
.plots { display: grid; grid-template-columns: repeat(auto-fill, minmax(460px, 1fr)); gap: 16px; align-items: start; }
.plots.wide { grid-template-columns: 1fr; }
.plots.pair { grid-template-columns: minmax(360px, 2fr) minmax(460px, 3fr); }
@media (max-width: 900px) { .plots.pair { grid-template-columns: 1fr; } }
figure.plot { margin: 0; background: ${PAPER}; border: 1px solid ${GRID}; border-radius: 6px; padding: 10px; overflow-x: auto; }
figure.plot svg { display: block; max-width: 100%; height: auto; }
figcaption { color: ${MUTED}; font-size: 12px; margin: 6px 4px 0; }
table.data { border-collapse: collapse; width: 100%; font-size: 13px; }
table.data th { text-align: left; font-weight: 600; color: ${MUTED}; border-bottom: 1px solid ${HAIRLINE}; padding: 4px 10px 4px 0; }
table.data td { border-bottom: 1px solid ${GRID}; padding: 4px 10px 4px 0; font-variant-numeric: tabular-nums; }
td.override, tr.override td { color: #D55E00; }
.status-bar { display: flex; height: 10px; border-radius: 5px; overflow: hidden; margin: 8px 0 4px; background: ${GRID}; }
.status-bar span { display: block; height: 100%; }
ul.notes { margin: 0; padding-left: 18px; color: ${MUTED}; }
footer { color: ${MUTED}; font-size: 12px; margin-top: 30px; }
details { margin-top: 14px; }
summary { cursor: pointer; color: ${MUTED}; }
table.kv thead { display: none; }
code { font-family: 'DejaVu Sans Mono', Menlo, Consolas, monospace; font-size: 12.5px; }
`;

/** A whole page: title, inline style (the report's, plus `extraCss`), body. */
export function htmlPage(title: string, body: string, extraCss = ''): string {
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8"/>
<meta name="viewport" content="width=device-width, initial-scale=1"/>
<title>${escapeHtml(title)}</title>
<style>${REPORT_CSS}${extraCss}</style>
</head>
<body>
<main>
${body}
</main>
</body>
</html>
`;
}
