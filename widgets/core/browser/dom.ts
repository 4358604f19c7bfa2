/**
 * A tiny element builder. Text goes in through textContent and attributes through
 * setAttribute, so strings from a state are never parsed as markup.
 */
export type Child = Node | string | null | undefined | false;

export function el<K extends keyof HTMLElementTagNameMap>(tag: K, attrs: Record<string, string | undefined> = {}, children: readonly Child[] = []): HTMLElementTagNameMap[K] {
  const node = document.createElement(tag);
  for (const [name, value] of Object.entries(attrs)) if (value !== undefined) node.setAttribute(name, value);
  for (const child of children) if (child) node.append(typeof child === "string" ? document.createTextNode(child) : child);
  return node;
}

/** Replaces all children of a node with text. */
export function setText(node: Node, text: string): void {
  node.textContent = text;
}

/** Adds a style sheet to the page once; later calls with the same id do nothing. */
export function injectStyleOnce(id: string, css: string, doc: Document = document): void {
  if (doc.getElementById(id)) return;
  const style = doc.createElement("style");
  style.id = id;
  style.textContent = css;
  (doc.head ?? doc.documentElement).append(style);
}

/** Shows a short note, hidden again after 2.5 s unless a newer note replaced it. */
export function flashText(note: HTMLElement, text: string): void {
  note.textContent = text;
  note.hidden = false;
  setTimeout(() => {
    if (note.textContent === text) note.hidden = true;
  }, 2500);
}
