/**
 * What a kind's page writers put around its state besides markup of their own: the static
 * figure (fallback for viewers without scripts) and the browser runtime's text. The writers are
 * pure; Node code reads the runtime (runtime-source.ts) and renders the figure (render/static.ts).
 */
export interface FigureParts {
  /** Static SVG of the figure, shown until the runtime boots and kept for viewers without scripts. */
  svg?: string;
  /** Static PNG (bytes), shown where inline SVG is stripped (e.g. untrusted notebooks). */
  png?: Uint8Array;
}

export interface FragmentParts extends FigureParts {
  /** The runtime's text, to carry in this fragment (a page or notebook needs it once). */
  runtime?: string;
}

export interface PageParts extends FigureParts {
  /** The runtime's text: a standalone page always carries it. */
  runtime: string;
}
