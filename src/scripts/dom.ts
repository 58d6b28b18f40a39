/**
 * DOM building for the browser modules: HTML elements (`h`) and chart node trees (`SvgNode`) as SVG elements
 * (d3-selection creates them in the SVG namespace). Attribute values and text go through setAttribute and
 * textContent, never through markup, so text from arm files stays text.
 */
import { select } from "d3-selection";
import type { SvgNode } from "../charts/nodes";

/** Appends `node` (and its children) under `parent`; returns the new element. */
export function appendSvgNode(parent: Element, node: SvgNode): Element {
  const sel = select(parent).append<Element>(node.tag);
  for (const [name, value] of Object.entries(node.attrs)) {
    if (value === null || value === undefined || value === false || name === "xmlns") continue;
    sel.attr(name, value === true ? name : String(value));
  }
  if (node.text !== undefined) sel.text(node.text);
  const el = sel.node()!;
  for (const child of node.children ?? []) appendSvgNode(el, child);
  return el;
}

/** An HTML element with an optional class, text (as textContent), attributes and children. */
export function h<K extends keyof HTMLElementTagNameMap>(
  tag: K,
  props: { className?: string; text?: string; attrs?: Record<string, string> } = {},
  ...children: (Node | string)[]
): HTMLElementTagNameMap[K] {
  const el = document.createElement(tag);
  if (props.className) el.className = props.className;
  if (props.text !== undefined) el.textContent = props.text;
  for (const [k, v] of Object.entries(props.attrs ?? {})) el.setAttribute(k, v);
  for (const c of children) el.append(c);
  return el;
}
