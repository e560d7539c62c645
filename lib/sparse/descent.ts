/**
 * Cyclic coordinate descent for one α on a Gram problem (G, c, v_y; see gram.ts), warm-started
 * from the previous α's solution. With per-column weights γ_j ≥ 0 (penalty.ts; all 1 without
 * weights), a_j = αργ_j and β_j = α(1 − ρ)γ_j, the objective in standardized coefficients w is
 *   P(w) = ½ (v_y − 2cᵀw + wᵀGw) + Σ_j a_j |w_j| + ½ Σ_j β_j w_j².
 * The solver keeps the gradient residuals g = c − Gw ("covariance updates", Friedman, Hastie &
 * Tibshirani 2010, J. Stat. Softw. 33, §2.2); the update of coordinate j is
 *   w_j ← S(g_j + G_jj w_j, a_j) / (G_jj + β_j),   S(z, a) = sign(z)·max(|z| − a, 0),
 * and a change δ in w_j costs g_k −= G_kj δ over the working set only. A column with γ_j = 0
 * is updated by plain least squares (a_j = β_j = 0).
 *
 * Screening (sequential strong rule, Tibshirani, Bien, Friedman, Hastie, Simon, Taylor &
 * Tibshirani 2012, JRSS-B 74; written here in this scaling, the threshold of column j scaled by
 * its weight as the same argument gives it — our derivation, not checked against the paper):
 * with α₀ the previous α (≤ α_max), the working set is the previous nonzeros plus every j with
 * |g_j(α₀)| ≥ ργ_j(2α − α₀) — so every unpenalized column (γ_j = 0) is always in it. The
 * working set is solved by passes over it alternating with passes over its nonzeros only
 * (active-set cycling), then g is recomputed from scratch for every column and the optimality
 * (KKT) conditions are checked over all columns; violators join the working set and the solve
 * repeats. So screening only saves work: it never changes the answer.
 *
 * Stopping rule: the KKT violation of column j,
 *   w_j ≠ 0:  |g_j − β_j w_j − a_j·sign(w_j)|,      w_j = 0:  max(|g_j| − a_j, 0)
 * (for γ_j = 0 both read |g_j|: the column's least-squares condition),
 * divided by √(G_jj v_y) (a correlation-like, unit-free number: |g_j| ≤ √(G_jj v_y) at w = 0),
 * must be at most `tolerance` for every column, with g recomputed from scratch.
 *
 * @module
 */
import type { GramProblem } from "./gram.ts";
import { nullSolution } from "./unpenalized.ts";

/** Coefficients and gradient residuals carried along a path (mutated in place). */
export interface DescentState {
  /** Standardized coefficients w. */
  readonly w: Float64Array;
  /** g = c − Gw for every column, exact (recomputed) at the end of each solve. */
  readonly g: Float64Array;
  /** The α at which (w, g) were last solved, capped at α_max. */
  previousAlpha: number;
}

/** Limits of one solve. */
export interface DescentSettings {
  /** Largest scaled KKT violation accepted. */
  readonly tolerance: number;
  /** Most coordinate passes for one α. */
  readonly maxPasses: number;
  /** Use the sequential strong rule (true) or start from every column (false). */
  readonly screening: boolean;
}

/** What one solve did. */
export interface DescentOutcome {
  /** Coordinate passes (over the working set or its nonzeros). */
  readonly passes: number;
  /** Largest scaled KKT violation over all columns at the returned solution. */
  readonly violation: number;
  readonly converged: boolean;
}

/**
 * The state at α_max: every penalized coefficient 0 and the `unpenalized` columns (γ = 0) at
 * their least-squares values (unpenalized.ts); w = 0 and g = c without unpenalized columns.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { gramProblem } from "./gram.ts";
 * import { startState } from "./descent.ts";
 * const [m] = bucketMoments(Float64Array.of(0, 1, 2), 1, Float64Array.of(1, 2, 4), new Int32Array(3), 1);
 * console.log(startState(gramProblem(m), 1.2).w); // Float64Array [0]
 * ```
 */
export function startState(
  problem: GramProblem,
  alphaMax: number,
  unpenalized: Int32Array = new Int32Array(0),
): DescentState {
  return { ...nullSolution(problem, unpenalized), previousAlpha: alphaMax };
}

/**
 * Solves at `alpha` from the state's solution, updating the state in place. `gamma`: the
 * weight γ_j ≥ 0 of every column (penalty.ts, `columnWeights`).
 *
 * @example
 * ```ts
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { gramProblem } from "./gram.ts";
 * import { descend, startState } from "./descent.ts";
 * const [m] = bucketMoments(Float64Array.of(0, 1, 2, 3), 1, Float64Array.of(0, 1, 2, 3), new Int32Array(4), 1);
 * const g = gramProblem(m, { standardize: false });
 * const state = startState(g, 1.25);
 * descend(g, state, 0.25, 1, Float64Array.of(1), { tolerance: 1e-12, maxPasses: 100, screening: true });
 * console.log(state.w[0]); // 0.8 = 1 − 0.25/1.25
 * ```
 */
export function descend(
  problem: GramProblem,
  state: DescentState,
  alpha: number,
  mix: number,
  gamma: Float64Array,
  settings: DescentSettings,
): DescentOutcome {
  const { p } = problem;
  const l1 = alpha * mix;
  const l2 = alpha * (1 - mix);
  const a = gamma.map((g) => l1 * g);
  const beta = gamma.map((g) => l2 * g);
  const kkt = violationMeter(problem, state, a, beta);
  const member = new Uint8Array(p);
  const bound = mix * (2 * alpha - state.previousAlpha);
  for (let j = 0; j < p; j++) {
    const strong = !settings.screening || Math.abs(state.g[j]) >= bound * gamma[j];
    if (state.w[j] !== 0 || strong) member[j] = 1;
  }
  let passes = 0;
  let violation = Infinity;
  while (passes < settings.maxPasses) {
    const work = membersOf(member);
    passes += solveWorkingSet(problem, state, work, a, beta, kkt, settings, passes);
    refreshResiduals(problem, state);
    violation = 0;
    for (let j = 0; j < p; j++) {
      const v = kkt(j);
      violation = Math.max(violation, v);
      if (v > settings.tolerance) member[j] = 1;
    }
    if (violation <= settings.tolerance) break;
  }
  state.previousAlpha = Math.min(alpha, state.previousAlpha);
  return { passes, violation, converged: violation <= settings.tolerance };
}

/** Scaled KKT violation of column j at the state's current (w, g). */
function violationMeter(
  problem: GramProblem,
  state: DescentState,
  a: Float64Array,
  beta: Float64Array,
): (j: number) => number {
  const { gram, p, targetSquare } = problem;
  const unit = Float64Array.from(
    { length: p },
    (_, j) => Math.sqrt(gram[j * p + j] * targetSquare),
  );
  const { w, g } = state;
  return (j) => {
    const wj = w[j];
    const raw = wj === 0
      ? Math.max(Math.abs(g[j]) - a[j], 0)
      : Math.abs(g[j] - beta[j] * wj - (wj > 0 ? a[j] : -a[j]));
    return raw / unit[j];
  };
}

/**
 * Passes over the working set until a pass leaves every member within tolerance; between two
 * such passes, passes over the nonzero members only until they are within tolerance. Returns
 * the number of passes made (never more than the budget left).
 */
function solveWorkingSet(
  problem: GramProblem,
  state: DescentState,
  work: Int32Array,
  a: Float64Array,
  beta: Float64Array,
  kkt: (j: number) => number,
  settings: DescentSettings,
  used: number,
): number {
  const budget = settings.maxPasses - used;
  const within = (set: Int32Array) => set.every((j) => kkt(j) <= settings.tolerance);
  let passes = 0;
  while (passes < budget) {
    updatePass(problem, state, work, work, a, beta);
    passes++;
    if (within(work)) break;
    const active = work.filter((j) => state.w[j] !== 0);
    while (active.length > 0 && passes < budget) {
      updatePass(problem, state, active, work, a, beta);
      passes++;
      if (within(active)) break;
    }
  }
  return passes;
}

/** One cyclic pass of coordinate updates over `set`, keeping g current over `work`. */
function updatePass(
  problem: GramProblem,
  state: DescentState,
  set: Int32Array,
  work: Int32Array,
  a: Float64Array,
  beta: Float64Array,
): void {
  const { gram, p } = problem;
  const { w, g } = state;
  for (let t = 0; t < set.length; t++) {
    const j = set[t];
    const row = j * p;
    const gjj = gram[row + j];
    const z = g[j] + gjj * w[j];
    const aj = a[j];
    const shrunk = z > aj ? z - aj : z < -aj ? z + aj : 0;
    const next = shrunk / (gjj + beta[j]);
    const delta = next - w[j];
    if (delta === 0) continue;
    w[j] = next;
    for (let u = 0; u < work.length; u++) {
      const k = work[u];
      g[k] -= gram[row + k] * delta;
    }
  }
}

/** g = c − Gw for every column, summed over the nonzero coefficients in index order. */
function refreshResiduals(problem: GramProblem, state: DescentState): void {
  const { gram, p, covariance } = problem;
  const { w, g } = state;
  g.set(covariance);
  for (let k = 0; k < p; k++) {
    const wk = w[k];
    if (wk === 0) continue;
    const row = k * p;
    for (let j = 0; j < p; j++) g[j] -= gram[row + j] * wk;
  }
}

function membersOf(member: Uint8Array): Int32Array {
  const out: number[] = [];
  member.forEach((m, j) => m && out.push(j));
  return Int32Array.from(out);
}
