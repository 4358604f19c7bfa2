import { combine, type Field, type LinearForm, zeroForm } from "./linear-form";
import { zeros } from "./number-blocks";
import type { ClassicalInput, InputInfo, ModeInfo, ModeKind, NoiseCategory, NoiseGroup, OutputInfo, StateSpaceModel } from "./model";

/** A block of white inputs declared by one component, with its own noise matrix. */
interface InputBlock {
  owner: string;
  first: number;
  labels: string[];
  /** k×k one-sided spectral density matrix of this block (row-major). */
  noise: Float64Array;
  category: NoiseCategory;
  /** Label for the whole block when its columns turn out correlated; absent: owner and labels (written only when needed). */
  blockLabel: string | undefined;
  /** One budget term for the whole block even where its columns are uncorrelated. */
  together: boolean;
  /**
   * The name a budget shows for the whole block's term, where it differs from the label that
   * identifies it (ids stay as they were: fingerprints hash them).
   */
  displayLabel: string | undefined;
}

/** What the wiring phase writes: A and B; the same without forces of light on bodies (rest) and those forces alone (see pushByLight); the signal column. */
interface Wiring {
  readonly A: Float64Array;
  readonly B: Float64Array;
  readonly restA: Float64Array;
  readonly restB: Float64Array;
  readonly forceA: Float64Array;
  readonly forceB: Float64Array;
  readonly signalB: Float64Array;
}

/**
 * Collects a set-up into a state-space model in two phases. In the allocation phase,
 * components claim modes (pairs of states) and blocks of white inputs; the sizes are then
 * frozen, and in the wiring phase components write their dynamics and build linear forms
 * of fixed length. The two phases exist because a linear form needs the final sizes.
 * `build` hands the matrices over to the model, which ends the builder's use.
 */
export class NetworkBuilder {
  private readonly modes: ModeInfo[] = [];
  private readonly blocks: InputBlock[] = [];
  private nStates = 0;
  private nInputs = 0;
  private phase: "allocating" | "wiring" | "built" = "allocating";
  /** Set by freeze. */
  private wiring: Wiring | undefined;
  private lightPushes = false;
  /** While set, what a component writes as the signal goes into this input column instead (see enterAsSignal). */
  private signalColumn: number | undefined;
  private readonly classical: ClassicalInput[] = [];
  private readonly outputRows: { info: OutputInfo; form: LinearForm }[] = [];

  // ---- allocation phase -------------------------------------------------------------

  /** Claims a mode; returns its state indices. */
  addMode(owner: string, kind: ModeKind, label: string): ModeInfo {
    this.assertAllocating("addMode");
    const mode: ModeInfo = { owner, kind, label, x: this.nStates, p: this.nStates + 1 };
    this.nStates += 2;
    this.modes.push(mode);
    return mode;
  }

  /**
   * Claims k white inputs with a k×k one-sided noise matrix (vacuum = identity).
   * Returns the index of the first input column. `displayLabel` names the whole block's term
   * in budgets without changing its id.
   */
  addInputs(owner: string, labels: string[], noise: ArrayLike<number>, category: NoiseCategory, blockLabel?: string, together = false, displayLabel?: string): number {
    this.assertAllocating("addInputs");
    const k = labels.length;
    if (noise.length !== k * k) throw new Error(`noise matrix for ${owner} must be ${k}×${k}`);
    const first = this.nInputs;
    this.blocks.push({ owner, first, labels: labels.slice(), noise: Float64Array.from(noise), category, blockLabel, together, displayLabel });
    this.nInputs += k;
    return first;
  }

  /**
   * Claims one input column for a classical noise with its own spectrum (its entry in N is 1,
   * replaced by `psdAt` at each frequency); it becomes a budget term of its own.
   */
  addClassicalInput(owner: string, label: string, psdAt: ClassicalInput["psdAt"], requireCovers: ClassicalInput["requireCovers"]): number {
    const column = this.addInputs(owner, [label], [1], "classical");
    this.classical.push({ column, owner, psdAt, requireCovers });
    return column;
  }

  /** Ends allocation: sizes are fixed from here on. */
  freeze(): void {
    this.assertAllocating("freeze");
    this.phase = "wiring";
    const nn = this.nStates * this.nStates;
    const nm = this.nStates * this.nInputs;
    this.wiring = { A: zeros(nn), B: zeros(nm), restA: zeros(nn), restB: zeros(nm), forceA: zeros(nn), forceB: zeros(nm), signalB: zeros(this.nStates) };
  }

  // ---- wiring phase -----------------------------------------------------------------

  get stateCount(): number {
    return this.nStates;
  }

  get inputCount(): number {
    return this.nInputs;
  }

  zero(): LinearForm {
    this.assertWiring();
    return zeroForm(this.nStates, this.nInputs);
  }

  /** The form c·z_i. */
  state(i: number, c = 1): LinearForm {
    const f = this.zero();
    f.z[i] = c;
    return f;
  }

  /** The form c·w_j. */
  input(j: number, c = 1): LinearForm {
    const f = this.zero();
    f.w[j] = c;
    return f;
  }

  /** A field whose quadratures are the inputs j (amplitude) and j+1 (phase). */
  inputField(j: number): Field {
    return { amplitude: this.input(j), phase: this.input(j + 1) };
  }

  /** dz_i/dt += c · z_j */
  couple(i: number, j: number, c: number): void {
    const w = this.assertWiring();
    w.A[i * this.nStates + j] += c;
    w.restA[i * this.nStates + j] += c;
  }

  /** dz_i/dt += c · form */
  drive(i: number, form: LinearForm, c = 1): void {
    this.driveInto(i, form, c, true);
  }

  /**
   * dz_i/dt += c · form, where the term is the force of light on a body (radiation pressure,
   * the back-action of a spin readout). The same arithmetic as `drive`; the term is also kept
   * out of the model's back-action-free dynamics, from which the budget splits a light
   * source's noise into imprecision and back-action.
   */
  pushByLight(i: number, form: LinearForm, c: number): void {
    this.driveInto(i, form, c, false);
    this.lightPushes = true;
  }

  private driveInto(i: number, form: LinearForm, c: number, rest: boolean): void {
    const wiring = this.assertWiring();
    const n = this.nStates;
    const m = this.nInputs;
    for (let j = 0; j < n; j++) wiring.A[i * n + j] += c * form.z[j];
    for (let j = 0; j < m; j++) wiring.B[i * m + j] += c * form.w[j];
    wiring.signalB[i] += c * form.s;
    const a = rest ? wiring.restA : wiring.forceA;
    const b = rest ? wiring.restB : wiring.forceB;
    for (let j = 0; j < n; j++) a[i * n + j] += c * form.z[j];
    for (let j = 0; j < m; j++) b[i * m + j] += c * form.w[j];
  }

  /** dz_i/dt += c · s (the signal, in SI units). */
  driveBySignal(i: number, c: number): void {
    const wiring = this.assertWiring();
    if (this.signalColumn !== undefined) {
      const at = i * this.nInputs + this.signalColumn;
      wiring.B[at] += c;
      wiring.restB[at] += c;
      return;
    }
    wiring.signalB[i] += c;
  }

  /**
   * Runs `apply` (a component's applySignal) with the signal written into input column
   * `column` instead: a classical noise then enters exactly where, and with the same
   * coefficients as, a signal of that kind would.
   */
  enterAsSignal(column: number, apply: () => void): void {
    this.assertWiring();
    this.signalColumn = column;
    try {
      apply();
    } finally {
      this.signalColumn = undefined;
    }
  }

  /** Declares a detector output y = form. */
  addOutput(info: OutputInfo, form: LinearForm): void {
    this.assertWiring();
    this.outputRows.push({ info, form: combine(1, form, 0, form) });
  }

  /** The model; the builder's matrices become the model's, so the builder takes no more calls. */
  build(): StateSpaceModel {
    const { A, B, restA, restB, forceA, forceB, signalB } = this.assertWiring();
    this.phase = "built";
    this.wiring = undefined;
    const n = this.nStates;
    const m = this.nInputs;
    const p = this.outputRows.length;
    const C = zeros(p * n);
    const D = zeros(p * m);
    const signalD = zeros(p);
    const N = zeros(m * m);
    const outputs: OutputInfo[] = [];
    for (let k = 0; k < p; k++) {
      const row = this.outputRows[k];
      C.set(row.form.z, k * n);
      D.set(row.form.w, k * m);
      signalD[k] = row.form.s;
      outputs.push(row.info);
    }
    const inputs: InputInfo[] = [];
    const groups: NoiseGroup[] = [];
    for (const block of this.blocks) {
      const k = block.labels.length;
      for (let a = 0; a < k; a++) {
        inputs.push({ owner: block.owner, label: block.labels[a] });
        for (let b = 0; b < k; b++) N[(block.first + a) * m + block.first + b] = block.noise[a * k + b];
      }
      addCorrelatedGroups(block, groups);
    }
    disambiguateGroupIds(groups);
    const model: StateSpaceModel = { nStates: n, nInputs: m, nOutputs: p, A, B, C, D, N, signalB, signalD, modes: this.modes, inputs, groups, outputs };
    if (this.classical.length) Object.assign(model, { classicalInputs: this.classical });
    if (this.lightPushes) Object.assign(model, { lightForce: { A: forceA, B: forceB, restA, restB } });
    return model;
  }

  private assertAllocating(what: string): void {
    if (this.phase !== "allocating") throw new Error(`${what} called after the network was frozen`);
  }

  private assertWiring(): Wiring {
    if (this.wiring === undefined) throw new Error(this.phase === "built" ? "the network was already built into a model" : "the network must be frozen before wiring");
    return this.wiring;
  }
}

/**
 * Columns of a block that are correlated (directly or through a chain) must stay together;
 * uncorrelated columns become separate budget terms, e.g. a resonant readout's amplitude
 * quadrature (back-action) and phase quadrature (imprecision). Appends the block's groups to
 * `groups`, each in the order of its first column.
 */
function addCorrelatedGroups(block: InputBlock, groups: NoiseGroup[]): void {
  const k = block.labels.length;
  // root[a]: the first column of a's group; columns join while scanning, smallest first.
  const root: number[] = [];
  for (let a = 0; a < k; a++) root.push(a);
  for (let a = 0; a < k; a++) {
    for (let b = a + 1; b < k; b++) {
      if (block.together || block.noise[a * k + b] !== 0 || block.noise[b * k + a] !== 0) joinGroups(root, a, b);
    }
  }
  for (let first = 0; first < k; first++) {
    if (root[first] !== first) continue;
    const members: number[] = [];
    for (let a = first; a < k; a++) if (root[a] === first) members.push(a);
    // A column with zero noise contributes nothing; leaving it out keeps budgets clean.
    if (members.length === 1 && block.noise[first * k + first] === 0) continue;
    const whole = members.length === k;
    const label = whole && k > 1 ? (block.blockLabel ?? `${block.owner}: ${block.labels.join(" + ")}`) : `${block.owner}: ${members.map((a) => block.labels[a]).join(" + ")}`;
    groups.push({
      id: label,
      owner: block.owner,
      label: whole && block.displayLabel !== undefined ? block.displayLabel : label,
      category: block.category,
      columns: members.map((a) => block.first + a),
    });
  }
}

/** Merges the groups of columns a and b, every column keeping the smallest column of its group as its root. */
function joinGroups(root: number[], a: number, b: number): void {
  const keep = Math.min(root[a], root[b]);
  const drop = Math.max(root[a], root[b]);
  if (keep === drop) return;
  for (let c = 0; c < root.length; c++) if (root[c] === drop) root[c] = keep;
}

/** A second group with the same id gets " #2", a third " #3", … (in place). */
function disambiguateGroupIds(groups: NoiseGroup[]): void {
  // Pairwise: a model has a few dozen groups at most, and a map would hash every id.
  const ids = groups.map((g) => g.id);
  for (let k = 1; k < ids.length; k++) {
    let count = 0;
    for (let j = 0; j < k; j++) if (ids[j] === ids[k]) count++;
    if (count > 0) groups[k] = { ...groups[k], id: `${ids[k]} #${count + 1}` };
  }
}
