/**
 * DOM for the cell editor's results: a TableModel as the same markup DataTable.astro writes, and a node chart as the
 * same figure ChartFigure.astro writes (SVG elements made with d3-selection, text through textContent: never
 * innerHTML), so the editor's results look and print like the study page.
 */
import type { NodeChart } from "../charts/cellMarks";
import type { TableModel } from "../view/table";
import { appendSvgNode, h } from "./dom";

/** A table block: title, scroll box, table with header units, cells with notes and links. */
export function tableElement(table: TableModel): HTMLElement {
  const titleId = `${table.id}-title`;
  const head = h(
    "tr",
    {},
    ...table.columns.map((c) => {
      const th = h("th", {
        className: c.numeric ? "num" : "",
        text: c.label,
        attrs: { scope: "col", "data-key": c.key },
      });
      if (c.unit) th.append(" ", h("span", { className: "unit", text: `(${c.unit})` }));
      return th;
    }),
  );
  const body = h(
    "tbody",
    {},
    ...table.rows.map((row) => {
      const tr = h("tr", { attrs: { "data-key": row.key } });
      for (const [k, v] of Object.entries(row.data ?? {})) tr.setAttribute(`data-${k}`, v);
      row.cells.forEach((cell, i) => {
        const col = table.columns[i];
        const tag = table.rowHeaders && i === 0 ? "th" : "td";
        const td = h(tag, { className: col?.numeric ? "num" : "", attrs: col ? { "data-key": col.key } : {} });
        if (tag === "th") td.setAttribute("scope", "row");
        td.append(cell.href ? h("a", { text: cell.text, attrs: { href: cell.href } }) : cell.text);
        if (cell.note) td.append(h("span", { className: "cell-note", text: cell.note }));
        tr.append(td);
      });
      return tr;
    }),
  );
  const block = h(
    "div",
    { className: "table-block" },
    h("p", { className: "table-title", text: table.caption, attrs: { id: titleId } }),
    h(
      "div",
      { className: "table-scroll", attrs: { role: "region", "aria-labelledby": titleId, tabindex: "0" } },
      h(
        "table",
        { className: "data-table", attrs: { id: table.id, "aria-labelledby": titleId } },
        h("thead", {}, head),
        body,
      ),
    ),
  );
  if (table.footnote) block.append(h("p", { className: "table-footnote", text: table.footnote }));
  return block;
}

/** A chart figure with its caption. */
export function chartElement(chart: NodeChart): HTMLElement {
  const figure = h("figure", {
    className: "chart-figure",
    attrs: { id: `${chart.id}-figure`, "data-chart": chart.id },
  });
  appendSvgNode(figure, chart.node);
  figure.append(h("figcaption", {}, h("strong", { text: `${chart.title}.` }), ` ${chart.caption}`));
  return figure;
}
