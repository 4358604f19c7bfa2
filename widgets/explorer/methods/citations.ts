/** The published sources behind the formulas a methods text states, in both output formats. */
export type CitationKey = "braginsky1992" | "clerk2010" | "gardiner1985" | "aspelmeyer2014" | "caves1981" | "kimble2001" | "callen1951";

export interface Citation {
  readonly inline: { readonly markdown: string; readonly latex: string };
  readonly full: { readonly markdown: string; readonly latex: string };
}

export const CITATIONS: Readonly<Record<CitationKey, Citation>> = {
  braginsky1992: {
    inline: { markdown: "Braginsky & Khalili 1992", latex: "Braginsky \\& Khalili 1992" },
    full: {
      markdown: "V. B. Braginsky and F. Ya. Khalili, *Quantum Measurement* (Cambridge University Press, 1992).",
      latex: "V. B. Braginsky and F. Ya. Khalili, \\emph{Quantum Measurement} (Cambridge University Press, 1992).",
    },
  },
  clerk2010: {
    inline: { markdown: "Clerk et al. 2010", latex: "Clerk et~al.\\ 2010" },
    full: {
      markdown: "A. A. Clerk, M. H. Devoret, S. M. Girvin, F. Marquardt and R. J. Schoelkopf, Rev. Mod. Phys. **82**, 1155 (2010).",
      latex: "A. A. Clerk, M. H. Devoret, S. M. Girvin, F. Marquardt and R. J. Schoelkopf, Rev.\\ Mod.\\ Phys.\\ \\textbf{82}, 1155 (2010).",
    },
  },
  gardiner1985: {
    inline: { markdown: "Gardiner & Collett 1985", latex: "Gardiner \\& Collett 1985" },
    full: {
      markdown: "C. W. Gardiner and M. J. Collett, Phys. Rev. A **31**, 3761 (1985).",
      latex: "C. W. Gardiner and M. J. Collett, Phys.\\ Rev.\\ A \\textbf{31}, 3761 (1985).",
    },
  },
  aspelmeyer2014: {
    inline: { markdown: "Aspelmeyer, Kippenberg & Marquardt 2014", latex: "Aspelmeyer, Kippenberg \\& Marquardt 2014" },
    full: {
      markdown: "M. Aspelmeyer, T. J. Kippenberg and F. Marquardt, Rev. Mod. Phys. **86**, 1391 (2014).",
      latex: "M. Aspelmeyer, T. J. Kippenberg and F. Marquardt, Rev.\\ Mod.\\ Phys.\\ \\textbf{86}, 1391 (2014).",
    },
  },
  caves1981: {
    inline: { markdown: "Caves 1981", latex: "Caves 1981" },
    full: {
      markdown: "C. M. Caves, Phys. Rev. D **23**, 1693 (1981).",
      latex: "C. M. Caves, Phys.\\ Rev.\\ D \\textbf{23}, 1693 (1981).",
    },
  },
  kimble2001: {
    inline: { markdown: "Kimble et al. 2001", latex: "Kimble et~al.\\ 2001" },
    full: {
      markdown: "H. J. Kimble, Y. Levin, A. B. Matsko, K. S. Thorne and S. P. Vyatchanin, Phys. Rev. D **65**, 022002 (2001).",
      latex: "H. J. Kimble, Y. Levin, A. B. Matsko, K. S. Thorne and S. P. Vyatchanin, Phys.\\ Rev.\\ D \\textbf{65}, 022002 (2001).",
    },
  },
  callen1951: {
    inline: { markdown: "Callen & Welton 1951", latex: "Callen \\& Welton 1951" },
    full: {
      markdown: "H. B. Callen and T. A. Welton, Phys. Rev. **83**, 34 (1951).",
      latex: "H. B. Callen and T. A. Welton, Phys.\\ Rev.\\ \\textbf{83}, 34 (1951).",
    },
  },
};
