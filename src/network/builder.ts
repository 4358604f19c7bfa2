import { combine, type Field, type LinearForm, zeroForm } from "./linear-form";
import type { ClassicalInput, InputInfo, ModeInfo, ModeKind, NoiseCategory, NoiseGroup, OutputInfo, StateSpaceModel } from "./model";

/** A block of white inputs declared by one component, with its own noise matrix. */
interface InputBlock {
  owner: string;
  first: number;
  labels: string[];
  /** k×k one-sided spectral density matrix of this block (row-major). */
  noise: Float64Array;
  category: NoiseCategory;
  /** Optional label for the whole block when its columns turn out correlated. */
  blockLabel: string;
  /** One budget term for the whole block even where its columns are uncorrelated. */
  together: boolean;
  /**
   * The name a budget shows for the whole block's term, where it differs from the label that
   * identifies it (ids stay as they were: fingerprints hash them).
   */
  displayLabel?: string;
}

/**
 * Collects a set-up into a state-space model in two phases. In the allocation phase,
 * components claim modes (pairs of states) and blocks of white inputs; the sizes are then
 * frozen, and in the wiring phase components write their dynamics and build linear forms
 * of fixed length. The two phases exist because a linear form needs the final sizes.
 */
export class NetworkBuilder {
  private readonly modes: ModeInfo[] = [];
  private readonly blocks: InputBlock[] = [];
  private nStates = 0;
  private nInputs = 0;
  private frozen = false;

  private A = new Float64Array(0);
  private B = new Float64Array(0);
  /** A and B as written by everything except forces of light on bodies, and those forces alone (see pushByLight). */
  private restA = new Float64Array(0);
  private restB = new Float64Array(0);
  private forceA = new Float64Array(0);
  private forceB = new Float64Array(0);
  private lightPushes = false;
  private signalB = new Float64Array(0);
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
    this.blocks.push({
      owner,
      first,
      labels: [...labels],
      noise: Float64Array.from(noise),
      category,
      blockLabel: blockLabel ?? `${owner}: ${labels.join(" + ")}`,
      together,
      ...(displayLabel === undefined ? {} : { displayLabel }),
    });
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
    this.frozen = true;
    this.A = new Float64Array(this.nStates * this.nStates);
    this.B = new Float64Array(this.nStates * this.nInputs);
    this.restA = new Float64Array(this.nStates * this.nStates);
    this.restB = new Float64Array(this.nStates * this.nInputs);
    this.forceA = new Float64Array(this.nStates * this.nStates);
    this.forceB = new Float64Array(this.nStates * this.nInputs);
    this.signalB = new Float64Array(this.nStates);
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
    this.assertWiring();
    this.A[i * this.nStates + j] += c;
    this.restA[i * this.nStates + j] += c;
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
    this.assertWiring();
    const n = this.nStates;
    const m = this.nInputs;
    for (let j = 0; j < n; j++) this.A[i * n + j] += c * form.z[j];
    for (let j = 0; j < m; j++) this.B[i * m + j] += c * form.w[j];
    this.signalB[i] += c * form.s;
    const [a, b] = rest ? [this.restA, this.restB] : [this.forceA, this.forceB];
    for (let j = 0; j < n; j++) a[i * n + j] += c * form.z[j];
    for (let j = 0; j < m; j++) b[i * m + j] += c * form.w[j];
  }

  /** dz_i/dt += c · s (the signal, in SI units). */
  driveBySignal(i: number, c: number): void {
    this.assertWiring();
    if (this.signalColumn !== undefined) {
      const at = i * this.nInputs + this.signalColumn;
      this.B[at] += c;
      this.restB[at] += c;
      return;
    }
    this.signalB[i] += c;
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

  build(): StateSpaceModel {
    this.assertWiring();
    const n = this.nStates;
    const m = this.nInputs;
    const p = this.outputRows.length;
    const C = new Float64Array(p * n);
    const D = new Float64Array(p * m);
    const signalD = new Float64Array(p);
    this.outputRows.forEach((row, k) => {
      C.set(row.form.z, k * n);
      D.set(row.form.w, k * m);
      signalD[k] = row.form.s;
    });
    const N = new Float64Array(m * m);
    const inputs: InputInfo[] = [];
    const groups: NoiseGroup[] = [];
    for (const block of this.blocks) {
      const k = block.labels.length;
      for (let a = 0; a < k; a++) {
        inputs.push({ owner: block.owner, label: block.labels[a] });
        for (let b = 0; b < k; b++) N[(block.first + a) * m + block.first + b] = block.noise[a * k + b];
      }
      groups.push(...splitIntoCorrelatedGroups(block));
    }
    return {
      nStates: n,
      nInputs: m,
      nOutputs: p,
      A: this.A.slice(),
      B: this.B.slice(),
      C,
      D,
      N,
      signalB: this.signalB.slice(),
      signalD,
      modes: [...this.modes],
      inputs,
      groups: disambiguateGroupIds(groups),
      outputs: this.outputRows.map((r) => r.info),
      ...(this.classical.length ? { classicalInputs: [...this.classical] } : {}),
      ...(this.lightPushes ? { lightForce: { A: this.forceA.slice(), B: this.forceB.slice(), restA: this.restA.slice(), restB: this.restB.slice() } } : {}),
    };
  }

  private assertAllocating(what: string): void {
    if (this.frozen) throw new Error(`${what} called after the network was frozen`);
  }

  private assertWiring(): void {
    if (!this.frozen) throw new Error("the network must be frozen before wiring");
  }
}

/**
 * Columns of a block that are correlated (directly or through a chain) must stay together;
 * uncorrelated columns become separate budget terms, e.g. a resonant readout's amplitude
 * quadrature (back-action) and phase quadrature (imprecision).
 */
function splitIntoCorrelatedGroups(block: InputBlock): NoiseGroup[] {
  const k = block.labels.length;
  const parent = Array.from({ length: k }, (_, i) => i);
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i])));
  for (let a = 0; a < k; a++) {
    for (let b = a + 1; b < k; b++) {
      if (block.together || block.noise[a * k + b] !== 0 || block.noise[b * k + a] !== 0) parent[find(a)] = find(b);
    }
  }
  const byRoot = new Map<number, number[]>();
  for (let a = 0; a < k; a++) {
    const r = find(a);
    const list = byRoot.get(r) ?? [];
    list.push(a);
    byRoot.set(r, list);
  }
  const groups: NoiseGroup[] = [];
  for (const members of byRoot.values()) {
    // A column with zero noise contributes nothing; leaving it out keeps budgets clean.
    if (members.length === 1 && block.noise[members[0] * k + members[0]] === 0) continue;
    const whole = members.length === k;
    const label = whole && k > 1 ? block.blockLabel : `${block.owner}: ${members.map((a) => block.labels[a]).join(" + ")}`;
    groups.push({
      id: label,
      owner: block.owner,
      label: whole && block.displayLabel !== undefined ? block.displayLabel : label,
      category: block.category,
      columns: members.map((a) => block.first + a),
    });
  }
  return groups;
}

function disambiguateGroupIds(groups: NoiseGroup[]): NoiseGroup[] {
  const seen = new Map<string, number>();
  return groups.map((g) => {
    const count = seen.get(g.id) ?? 0;
    seen.set(g.id, count + 1);
    return count === 0 ? g : { ...g, id: `${g.id} #${count + 1}` };
  });
}
