/**
 * The report's fixed wording: the method notes (each with its formula and published source) and
 * the limitations and cautions.
 */
import type { MethodNote } from "./view.js";

export const METHODS: Omit<MethodNote, "id">[] = [
  {
    term: "Time average of a level",
    formula: "ȳ = A / T,  A = Σ vᵢ·dᵢ,  T = end − c,  c = max(start, warm-up)",
    text: "The level holds value vᵢ for duration dᵢ inside the window; the area A is the sum of value × duration and the time average divides it by the window's length. An interval that straddles the warm-up or the end counts only its part inside the window.",
    source: "Little, J. D. C. (1961). A proof for the queuing formula L = λW. Operations Research 9(3), 383–387 (time-average number in system).",
  },
  {
    term: "Time-weighted standard deviation",
    formula: "s_T = √( Σ dᵢ·(vᵢ − ȳ)² / T )",
    text: "The spread of the level over time: each squared deviation from the time average is weighted by how long it lasted. Minimum and maximum are taken over intervals of positive duration.",
    source: "The same time weighting as the time average; accumulated by West's weighted update: West, D. H. D. (1979). Updating mean and variance estimates: an improved method. Communications of the ACM 22(9), 532–535.",
  },
  {
    term: "Utilization",
    formula: "u = A(busy) / A(capacity)",
    text: "Area under the busy level divided by the area under the capacity (a constant capacity k gives A(capacity) = k·T).",
    source: "Little (1961), applied to the units in service.",
  },
  {
    term: "Mean and sample standard deviation",
    formula: "x̄ = Σ xᵢ / n,  s = √( Σ (xᵢ − x̄)² / (n − 1) )",
    text: "Used for observations within a run and for run values across runs. The divisor n − 1 makes s² unbiased for the variance. Within a run it is computed in two passes over the stored observations with the correction term of Chan, Golub and LeVeque; across runs the sums are exactly rounded, so the order of the runs changes nothing.",
    source: "Chan, T. F., Golub, G. H., LeVeque, R. J. (1983). Algorithms for computing the sample variance: analysis and recommendations. The American Statistician 37(3), 242–247.",
  },
  {
    term: "Count and rate",
    formula: "rate = n / T",
    text: "The number of rows of the series inside the window, and that number per time unit of window.",
    source: "Definition.",
  },
  {
    term: "Confidence interval across runs (Student t)",
    formula: "x̄ ± t(1 − α/2; n − 1) · s / √n,  half-width h = t · s / √n,  relative precision h / |x̄|",
    text: "Each run contributes one value (its time average, utilization, mean or count). The t quantile has n − 1 degrees of freedom at the study's confidence 1 − α.",
    source: "Student (1908). The probable error of a mean. Biometrika 6(1), 1–25.",
  },
  {
    term: "Compensated summation",
    formula: "s ← s + x, with the rounding error of each addition carried in a separate term",
    text: "All long sums (areas, running sums) carry the low-order digits lost in each addition, so the order of millions of terms does not change the reported digits.",
    source: "Kahan, W. (1965). Further remarks on reducing truncation errors. Communications of the ACM 8(1), 40; Neumaier, A. (1974). Rundungsfehleranalyse einiger Verfahren zur Summation endlicher Summen. ZAMM 54(1), 39–51.",
  },
  {
    term: "Warm-up by MSER-5",
    formula: "d* = argmin_d  Σ_{j>d} (Z_j − Z̄_d)² / (k − d)²,  Z_j = means of batches of 5",
    text: "The series is cut into batches of five; the truncation point d* minimizes the marginal standard error of what remains (searched over the first half). The warm-up is the time at the end of batch d*.",
    source: "White, K. P. Jr. (1997). An effective truncation heuristic for bias reduction in simulation output. Simulation 69(6), 323–334.",
  },
  {
    term: "Warm-up plot",
    formula: "Ȳ_j = (1/R) Σ_r Y_rj;  Ȳ_j(w) = mean of Ȳ_{j−w} … Ȳ_{j+w} (of Ȳ_1 … Ȳ_{2j−1} for j ≤ w);  w = m/20 rounded, 1 ≤ w ≤ m/4",
    text: "Each run's time average over slices of equal width, averaged over the R runs slice by slice (Ȳ_j for slices j = 1 … m), then smoothed by a centred moving average of 2w + 1 slices. The plot shows both lines and the warm-up MSER-5 chose as a vertical rule; the smoothed line should be flat to the right of the rule. If it still drifts, the runs are too short or the system has no steady state.",
    source: "Welch, P. D. (1983). The statistical analysis of simulation results. In S. S. Lavenberg (ed.), Computer Performance Modeling Handbook, Academic Press, 268–328.",
  },
  {
    term: "Batch means within one run",
    formula: "Z_j = batch averages (j = 1..k),  Z̄ ± t(1 − α/2; k − 1) · s_Z / √k,  lag-1 r = Σ (Z_j − Z̄)(Z_{j+1} − Z̄) / Σ (Z_j − Z̄)²",
    text: "One long run is cut into k batches (a level: k stretches of equal time, prorated at the edges; observations: k groups of ⌊n/k⌋ consecutive values after dropping the n mod k oldest); their averages are treated as roughly independent and give an interval for the run's long-run mean. A lag-1 correlation above 0.2 in size says the batches are probably too short: the report flags it and warns.",
    source: "Schmeiser, B. (1982). Batch size effects in the analysis of simulation output. Operations Research 30(3), 556–568.",
  },
  {
    term: "Comparing two scenarios (unequal variances)",
    formula: "x̄_a − x̄_b ± t(1 − α/2; ν) · √(s_a²/n_a + s_b²/n_b),  ν = (s_a²/n_a + s_b²/n_b)² / ( (s_a²/n_a)²/(n_a − 1) + (s_b²/n_b)²/(n_b − 1) )",
    text: "For independent runs of two scenarios. With paired runs (common random numbers) the interval is the Student t interval of the run-by-run differences.",
    source: "Welch, B. L. (1947). The generalization of “Student's” problem when several different population variances are involved. Biometrika 34(1–2), 28–35.",
  },
  {
    term: "Several comparisons at once (Bonferroni)",
    formula: "each interval at 1 − α/m for m comparisons",
    text: "Makes all m intervals hold together with probability at least 1 − α.",
    source: "Bonferroni, C. E. (1936). Teoria statistica delle classi e calcolo delle probabilità. Pubblicazioni del R. Istituto Superiore di Scienze Economiche e Commerciali di Firenze 8, 3–62; Dunn, O. J. (1961). Multiple comparisons among means. JASA 56, 52–64.",
  },
  {
    term: "Quantiles (type 7)",
    formula: "Q(p) = x₍ⱼ₎ + g·(x₍ⱼ₊₁₎ − x₍ⱼ₎),  h = (n − 1)·p,  j = ⌊h⌋ + 1,  g = h − ⌊h⌋",
    text: "Linear interpolation between the order statistics x₍₁₎ ≤ … ≤ x₍ₙ₎ of a run's observations.",
    source: "Hyndman, R. J., & Fan, Y. (1996). Sample quantiles in statistical packages. The American Statistician 50(4), 361–365.",
  },
  {
    term: "Intervals for per-run quantiles and shares",
    formula: "q_r = quantile (or share) of run r;  q̄ ± t(1 − α/2; n − 1) · s_q / √n",
    text: "Each run gives its own quantile, share of values within a threshold, or share of time at or above a level; the interval treats these n per-run figures like any run value. It is an interval for the expected per-run quantile or share (what one run of this length gives on average), not for the quantile or share of all observations pooled, which can differ, most of all for short runs and extreme quantiles. The distribution chart, by contrast, pools the observations.",
    source: "Follows from the Student t interval above; the quantile definition is Hyndman and Fan (1996), type 7.",
  },
  {
    term: "Runs needed for a target precision",
    formula: "n* = smallest k with t(1 − α/2; k − 1) · s / √k ≤ h*  (h* = target half-width, or γ/(1 + γ) × |x̄| for a relative error γ)",
    text: "How many runs would bring the half-width down to the target, treating the current sd s as if it were exact; a planning figure, not a promise. A relative error γ means the estimate within γ of the true mean: since the interval is centred on x̄, not on the unknown mean, that needs a half-width of γ/(1 + γ) × |x̄|. With one run, identical runs or a mean of 0 for a relative target there is no number, and the table says why.",
    source: "Follows from the Student t half-width above; the adjusted relative error γ/(1 + γ) is that of the sequential procedure for a relative precision in Law (2015), Simulation Modeling and Analysis, 5th ed., §9.4.1 (cited from memory; the derivation is in docs/statistics.md).",
  },
  {
    term: "Little's law (consistency check)",
    formula: "L = λ · W",
    text: "Time-average number in a system equals arrival rate times mean time in the system, over a long window that starts and ends nearly empty. L counts the entities inside: an entity level with an initial value is taken less that value.",
    source: "Little, J. D. C. (1961). Operations Research 9(3), 383–387.",
  },
];

/**
 * The caution of the response curves, shown after the others when the study has any: what a
 * curve's points assume and what its lines do not say.
 */
export const CURVE_CAUTION = "Each point of a response curve is its scenario's own interval, with the assumptions of that interval; " +
  "the points are not jointly at the stated confidence, and the lines between them only guide the eye: no factor value between two points was simulated and no model is fitted, so a curve says nothing about values between or beyond its points.";

/**
 * The caution of the selections of the best, shown after the others when the study has any: what
 * the procedures assume, and which runs are the first stage.
 */
export const SELECTION_CAUTION = "A selection of the best assumes that each scenario's run values are normally distributed and that the runs are independent: " +
  "across scenarios too, or, with runs paired by id (common random numbers), that run i of every scenario shares its random numbers and the pairs are independent of each other. " +
  "The first stage is the first n0 runs of each scenario in the order the manifest lists them (a glob lists them by name); the runs needed are counted from there, so runs added later must come after them. " +
  "The probability is for the whole selection: a difference smaller than the indifference amount counts as no difference, and the probability says nothing about scenarios that were not simulated.";

export const LIMITATIONS = [
  "The report summarises what the simulation model produced. Whether the model represents the real system (its logic, its input distributions, its data) is outside this tool and has to be established separately.",
  "Each interval assumes that the run values of a scenario are independent and identically distributed (separate random-number streams, same settings) and roughly normal; with few runs or skewed values the stated confidence is approximate.",
  "The warm-up choice changes every figure. Check it against the level traces: the shaded warm-up should cover the start-up period, and a different reasonable choice should not change the conclusions.",
  "A half-width describes only the sampling error of the runs. It does not include errors of the model, its data, or the window chosen.",
  "Several intervals read side by side are not jointly at the stated confidence unless adjusted (see Bonferroni in the method notes).",
  "Decisions that affect people's safety or health must go to qualified review under the rules that apply locally; this report is one input to such a review, not a substitute for it.",
];
