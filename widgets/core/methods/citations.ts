/**
 * The published sources behind what a methods text states: the reference line for Markdown
 * and LaTeX, and the BibTeX entry (with its DOI) that LaTeX cites with \cite.
 */

interface Source {
  readonly type: "article" | "book";
  readonly authors: readonly string[];
  readonly title: string;
  /** Journal (articles) or publisher (books). */
  readonly venue: string;
  readonly volume?: string;
  readonly pages?: string;
  readonly year: string;
  readonly doi: string;
}

const SOURCES = {
  braginsky1992: {
    type: "book",
    authors: ["V. B. Braginsky", "F. Ya. Khalili"],
    title: "Quantum Measurement",
    venue: "Cambridge University Press",
    year: "1992",
    doi: "10.1017/CBO9780511622748",
  },
  clerk2010: {
    type: "article",
    authors: ["A. A. Clerk", "M. H. Devoret", "S. M. Girvin", "F. Marquardt", "R. J. Schoelkopf"],
    title: "Introduction to quantum noise, measurement, and amplification",
    venue: "Rev. Mod. Phys.",
    volume: "82",
    pages: "1155",
    year: "2010",
    doi: "10.1103/RevModPhys.82.1155",
  },
  gardiner1985: {
    type: "article",
    authors: ["C. W. Gardiner", "M. J. Collett"],
    title: "Input and output in damped quantum systems: Quantum stochastic differential equations and the master equation",
    venue: "Phys. Rev. A",
    volume: "31",
    pages: "3761",
    year: "1985",
    doi: "10.1103/PhysRevA.31.3761",
  },
  aspelmeyer2014: {
    type: "article",
    authors: ["M. Aspelmeyer", "T. J. Kippenberg", "F. Marquardt"],
    title: "Cavity optomechanics",
    venue: "Rev. Mod. Phys.",
    volume: "86",
    pages: "1391",
    year: "2014",
    doi: "10.1103/RevModPhys.86.1391",
  },
  caves1981: {
    type: "article",
    authors: ["C. M. Caves"],
    title: "Quantum-mechanical noise in an interferometer",
    venue: "Phys. Rev. D",
    volume: "23",
    pages: "1693",
    year: "1981",
    doi: "10.1103/PhysRevD.23.1693",
  },
  kimble2001: {
    type: "article",
    authors: ["H. J. Kimble", "Y. Levin", "A. B. Matsko", "K. S. Thorne", "S. P. Vyatchanin"],
    title: "Conversion of conventional gravitational-wave interferometers into quantum nondemolition interferometers by modifying their input and/or output optics",
    venue: "Phys. Rev. D",
    volume: "65",
    pages: "022002",
    year: "2001",
    doi: "10.1103/PhysRevD.65.022002",
  },
  callen1951: {
    type: "article",
    authors: ["H. B. Callen", "T. A. Welton"],
    title: "Irreversibility and generalized noise",
    venue: "Phys. Rev.",
    volume: "83",
    pages: "34",
    year: "1951",
    doi: "10.1103/PhysRev.83.34",
  },
  holstein1940: {
    type: "article",
    authors: ["T. Holstein", "H. Primakoff"],
    title: "Field dependence of the intrinsic domain magnetization of a ferromagnet",
    venue: "Phys. Rev.",
    volume: "58",
    pages: "1098",
    year: "1940",
    doi: "10.1103/PhysRev.58.1098",
  },
  hammerer2010: {
    type: "article",
    authors: ["K. Hammerer", "A. S. Sørensen", "E. S. Polzik"],
    title: "Quantum interface between light and atomic ensembles",
    venue: "Rev. Mod. Phys.",
    volume: "82",
    pages: "1041",
    year: "2010",
    doi: "10.1103/RevModPhys.82.1041",
  },
  weedbrook2012: {
    type: "article",
    authors: ["C. Weedbrook", "S. Pirandola", "R. García-Patrón", "N. J. Cerf", "T. C. Ralph", "J. H. Shapiro", "S. Lloyd"],
    title: "Gaussian quantum information",
    venue: "Rev. Mod. Phys.",
    volume: "84",
    pages: "621",
    year: "2012",
    doi: "10.1103/RevModPhys.84.621",
  },
  duan2000: {
    type: "article",
    authors: ["L.-M. Duan", "G. Giedke", "J. I. Cirac", "P. Zoller"],
    title: "Inseparability criterion for continuous variable systems",
    venue: "Phys. Rev. Lett.",
    volume: "84",
    pages: "2722",
    year: "2000",
    doi: "10.1103/PhysRevLett.84.2722",
  },
  vidal2002: {
    type: "article",
    authors: ["G. Vidal", "R. F. Werner"],
    title: "Computable measure of entanglement",
    venue: "Phys. Rev. A",
    volume: "65",
    pages: "032314",
    year: "2002",
    doi: "10.1103/PhysRevA.65.032314",
  },
  kalman1961: {
    type: "article",
    authors: ["R. E. Kalman", "R. S. Bucy"],
    title: "New results in linear filtering and prediction theory",
    venue: "J. Basic Eng.",
    volume: "83",
    pages: "95",
    year: "1961",
    doi: "10.1115/1.3658902",
  },
  vanloan1978: {
    type: "article",
    authors: ["C. F. Van Loan"],
    title: "Computing integrals involving the matrix exponential",
    venue: "IEEE Trans. Autom. Control",
    volume: "23",
    pages: "395",
    year: "1978",
    doi: "10.1109/TAC.1978.1101743",
  },
  marsaglia2000: {
    type: "article",
    authors: ["G. Marsaglia", "W. W. Tsang"],
    title: "The ziggurat method for generating random variables",
    venue: "J. Stat. Softw.",
    volume: "5",
    pages: "1",
    year: "2000",
    doi: "10.18637/jss.v005.i08",
  },
  blackman2021: {
    type: "article",
    authors: ["D. Blackman", "S. Vigna"],
    title: "Scrambled linear pseudorandom number generators",
    venue: "ACM Trans. Math. Softw.",
    volume: "47",
    pages: "36",
    year: "2021",
    doi: "10.1145/3460772",
  },
  nelder1965: {
    type: "article",
    authors: ["J. A. Nelder", "R. Mead"],
    title: "A simplex method for function minimization",
    venue: "Comput. J.",
    volume: "7",
    pages: "308",
    year: "1965",
    doi: "10.1093/comjnl/7.4.308",
  },
  hyndman1996: {
    type: "article",
    authors: ["R. J. Hyndman", "Y. Fan"],
    title: "Sample quantiles in statistical packages",
    venue: "Am. Stat.",
    volume: "50",
    pages: "361",
    year: "1996",
    doi: "10.1080/00031305.1996.10473566",
  },
  ridders1982: {
    type: "article",
    authors: ["C. J. F. Ridders"],
    title: "Accurate computation of F'(x) and F'(x)F''(x)",
    venue: "Adv. Eng. Softw.",
    volume: "4",
    pages: "75",
    year: "1982",
    doi: "10.1016/S0141-1195(82)80057-0",
  },
} as const satisfies Record<string, Source>;

export type CitationKey = keyof typeof SOURCES;

export const CITATION_KEYS = Object.keys(SOURCES) as CitationKey[];

/** The DOI of a source (tests check the form; the texts print it). */
export function citationDoi(key: CitationKey): string {
  return SOURCES[key].doi;
}

function authorList(authors: readonly string[]): string {
  return authors.length === 1 ? authors[0] : `${authors.slice(0, -1).join(", ")} and ${authors[authors.length - 1]}`;
}

/** The reference line in Markdown: authors, journal **volume**, page (year), DOI link. */
export function markdownReference(key: CitationKey): string {
  const s: Source = SOURCES[key];
  const where = s.type === "book" ? `*${s.title}* (${s.venue}, ${s.year})` : `${s.venue} **${s.volume}**, ${s.pages} (${s.year})`;
  return `${authorList(s.authors)}, ${where}, https://doi.org/${s.doi}.`;
}

/** Characters BibTeX and LaTeX read specially in a field, written so that they print as themselves. */
function bibText(s: string): string {
  return s
    .replace(/[{}&%$#_]/g, (c) => `\\${c}`)
    .replace(/ø/g, "{\\o}")
    .replace(/í/g, "{\\'i}")
    .replace(/é/g, "{\\'e}")
    .replace(/ó/g, "{\\'o}");
}

/** The BibTeX entry: authors "Last, First" joined by "and", title braced to keep its capitals. */
export function bibtexEntry(key: CitationKey): string {
  const s: Source = SOURCES[key];
  const author = s.authors
    .map((a) => {
      const parts = a.split(" ");
      const first = parts.filter((p) => /\.$/.test(p)).join(" ");
      const last = parts.filter((p) => !/\.$/.test(p)).join(" ");
      return `${bibText(last)}, ${first}`;
    })
    .join(" and ");
  const fields: [string, string][] = [
    ["author", author],
    ["title", `{${bibText(s.title)}}`],
    [s.type === "book" ? "publisher" : "journal", bibText(s.venue)],
    ...(s.volume ? ([["volume", s.volume]] as [string, string][]) : []),
    ...(s.pages ? ([["pages", s.pages]] as [string, string][]) : []),
    ["year", s.year],
    ["doi", s.doi],
  ];
  return `@${s.type}{${key},\n${fields.map(([k, v]) => `  ${k} = {${v}}`).join(",\n")}\n}\n`;
}
