/**
 * Integration methods for charge-based companion models: backward Euler (order 1) and the
 * variable-step second-order backward differentiation formula, BDF2 / Gear-2 (C. W. Gear,
 * Numerical Initial Value Problems in ODEs, 1971; variable-step form from Hairer, Nørsett &
 * Wanner, Solving ODEs I, 2nd ed., §III.5). Both are stiffly stable, so the fast diode
 * conduction modes are damped instead of ringing as they can with the trapezoidal rule.
 *
 * A method turns q(t_{n+1}), q(t_n), q(t_{n−1}) into dq/dt(t_{n+1}) ≈ α0·q_{n+1} + α1·q_n + α2·q_{n−1}.
 * Local truncation error (LTE) is estimated from divided differences of the accepted charges,
 * as SPICE does (Nagel, SPICE2, UCB/ERL M520, 1975, §4.3).
 */

export interface IntegrationMethod {
  readonly name: string;
  readonly order: 1 | 2;
  /** Writes α0, α1, α2 for step h after a previous step hPrev. */
  coefficients(h: number, hPrev: number, out: Float64Array): void;
  /**
   * LTE in charge for the step just taken, from the charges at t_{n+1}, t_n, t_{n−1}, t_{n−2}
   * (`q[0..3]`, `t[0..3]`).
   */
  truncationError(q: ArrayLike<number>, t: ArrayLike<number>): number;
}

export const backwardEuler: IntegrationMethod = {
  name: 'backward-euler',
  order: 1,
  coefficients(h, _hPrev, out) {
    out[0] = 1 / h;
    out[1] = -1 / h;
    out[2] = 0;
  },
  truncationError(q, t) {
    // ε ≈ (h²/2)·q'' with q'' ≈ 2·(second divided difference).
    const h = t[0] - t[1];
    const d1a = (q[0] - q[1]) / (t[0] - t[1]);
    const d1b = (q[1] - q[2]) / (t[1] - t[2]);
    const dd2 = (d1a - d1b) / (t[0] - t[2]);
    return Math.abs(h * h * dd2);
  },
};

export const bdf2: IntegrationMethod = {
  name: 'bdf2',
  order: 2,
  coefficients(h, hPrev, out) {
    const rho = h / hPrev;
    out[0] = (1 + 2 * rho) / ((1 + rho) * h);
    out[1] = -(1 + rho) / h;
    out[2] = (rho * rho) / ((1 + rho) * h);
  },
  truncationError(q, t) {
    // ε ≈ (h·(h + h_prev)/6)·h·q''' (reduces to the constant-step BDF2 error 2/9·h³·q''' within
    // the accuracy of the estimate), q''' ≈ 6·(third divided difference).
    const h = t[0] - t[1];
    const hp = t[1] - t[2];
    const d1a = (q[0] - q[1]) / (t[0] - t[1]);
    const d1b = (q[1] - q[2]) / (t[1] - t[2]);
    const d1c = (q[2] - q[3]) / (t[2] - t[3]);
    const d2a = (d1a - d1b) / (t[0] - t[2]);
    const d2b = (d1b - d1c) / (t[1] - t[3]);
    const dd3 = (d2a - d2b) / (t[0] - t[3]);
    return Math.abs(h * (h + hp) * h * dd3);
  },
};
