/**
 * Result types of the fitting engine. Shared contract between numerics/ and its users
 * (kinetics/, cell/). Matrices are arrays of rows (number[][]), vectors number[].
 */

/** Result of a linear least-squares solve y ≈ X·β (X is n×p, rows = observations). */
export interface LinearFit {
  coefficients: number[];
  /** Covariance s²(XᵀX)⁻¹ (scaled by the residual variance unless sigma was given). */
  covariance: number[][];
  standardErrors: number[];
  /** Raw residuals y − X·β (not multiplied by √w when weights are given). */
  residuals: number[];
  /** Residual sum of squares, Σ w_i·(y_i − x_iᵀβ)² (w_i = 1 without weights). */
  rss: number;
  /** s = sqrt(RSS/(n − p)). */
  residualStandardDeviation: number;
  /** R² = 1 − RSS/Σ(y − ȳ)² when the model has an intercept column, else 1 − RSS/Σy². */
  rSquared: number;
  degreesOfFreedom: number;
  /** Numerical rank of X as judged by the factorisation. */
  rank: number;
  warnings: string[];
  /**
   * Per coefficient: true when its column was judged linearly dependent on the others
   * (rank deficiency). Such a coefficient is fixed at 0 with zero covariance row/column,
   * and a warning names it.
   */
  aliased: boolean[];
  /**
   * How `covariance` was scaled: 'residual-variance' = s²(XᵀWX)⁻¹ (σ estimated from the
   * scatter), 'known-sigma' = (XᵀWX)⁻¹ with the weights taken as 1/σ² of known errors.
   */
  covarianceScaling: CovarianceScaling;
}

/** Covariance scaling used by a fit; see LinearFit.covarianceScaling. */
export type CovarianceScaling = 'residual-variance' | 'known-sigma';

/**
 * 'relative': covariance scaled by s² = RSS/dof (σ estimated from the residual scatter).
 * 'absolute': covariance left unscaled — the weights (linear) or the residuals' own
 * scaling (nonlinear) already express known measurement σ.
 */
export type SigmaMode = 'relative' | 'absolute';

export interface LinearFitOptions {
  /** True when one column of X is the constant 1 (selects centred R²). Default: detected. */
  hasIntercept?: boolean;
  /** Iterative refinement steps with extended-precision residuals (default 2). */
  refinementSteps?: number;
  /** Observation weights (1/σ²); covariance then uses them. */
  weights?: number[];
  /**
   * Covariance scaling. Default 'absolute' when weights are given (σ known), 'relative'
   * otherwise.
   */
  sigmaMode?: SigmaMode;
  /**
   * Relative rank tolerance τ on the column-equilibrated, pivoted R: a column is judged
   * dependent when |R_kk| ≤ τ·|R_00|. Default max(n, p)·ε (ε = 2^−52).
   */
  rankTolerance?: number;
}

export type NonlinearStatus =
  | 'converged:ftol' // relative reduction of the cost below ftol
  | 'converged:xtol' // relative step below xtol
  | 'converged:gtol' // scaled gradient below gtol
  | 'failed:max-evaluations'
  | 'failed:non-finite' // residuals became NaN/Infinity and could not be recovered
  | 'failed:singular' // Jacobian rank-deficient at the start, or at the end (parameters not identifiable)
  | 'failed:not-stationary' // the steps stalled at a point where the cost still decreases
  | 'failed:bad-jacobian'; // the analytic Jacobian disagrees with finite differences

export interface NonlinearProblem {
  /** Residual vector r(p) (model − data or data − model; sign does not matter). */
  residuals: (p: number[]) => number[];
  /** Optional analytic Jacobian ∂r_i/∂p_j, n×p rows. Finite differences otherwise. */
  jacobian?: (p: number[]) => number[][];
  /** Starting point. */
  start: number[];
}

export interface NonlinearOptions {
  /** Stop when actual and predicted relative reductions of the RSS are ≤ ftol (default 1e-12). */
  ftol?: number;
  /** Stop when the trust-region radius is ≤ xtol·‖D·p‖ (relative step; default 1e-12). */
  xtol?: number;
  /** Stop when the largest cosine between r and a column of J is ≤ gtol (default 1e-12). */
  gtol?: number;
  /**
   * Residual evaluations allowed, finite-difference ones included. Default
   * 100·(p + 1)·(1 + evaluations per Jacobian): 0 analytic, 2p central, p forward.
   */
  maxEvaluations?: number;
  /** Forward or central finite differences when no Jacobian is given (default central). */
  finiteDifference?: 'forward' | 'central';
  /**
   * Covariance scaling (default 'relative' = s²(JᵀJ)⁻¹). 'absolute' gives (JᵀJ)⁻¹, for
   * residuals already divided by known measurement σ.
   */
  sigmaMode?: SigmaMode;
  /**
   * Compare an analytic Jacobian with central differences at the solution (default true;
   * costs up to 6p residual evaluations: Richardson-extrapolated central differences). A clear disagreement gives status 'failed:bad-jacobian'.
   */
  checkJacobian?: boolean;
  /** Initial trust-region radius as a multiple of ‖D·x₀‖ (MINPACK "factor", default 100). */
  initialStepBound?: number;
}

export interface NonlinearFit {
  parameters: number[];
  /**
   * s²(JᵀJ)⁻¹ at the solution, s² = RSS/(n − p); (JᵀJ)⁻¹ when sigmaMode is 'absolute'
   * (see covarianceScaling). Rows/columns of non-identifiable parameters are 0.
   */
  covariance: number[][];
  standardErrors: number[];
  residuals: number[];
  rss: number;
  residualStandardDeviation: number;
  degreesOfFreedom: number;
  converged: boolean;
  status: NonlinearStatus;
  message: string;
  /** Accepted Levenberg–Marquardt steps. */
  iterations: number;
  /** Residual-function calls, including those made for finite-difference Jacobians. */
  evaluations: number;
  /** Analytic Jacobian calls (0 when finite differences were used). */
  jacobianEvaluations: number;
  /**
   * Largest cosine |J_jᵀr|/(‖J_j‖·‖r‖) between the residual and a Jacobian column at the
   * returned parameters (MINPACK's scaled gradient); ≈ 0 at a stationary point.
   */
  gradientCosine: number;
  /** Per parameter: true when not identifiable (Jacobian rank-deficient at the solution). */
  aliased: boolean[];
  covarianceScaling: CovarianceScaling;
  warnings: string[];
}
