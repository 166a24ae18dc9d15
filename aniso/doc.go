// Package aniso knows fibre-reinforced incompressible membranes: fibre
// families, in-plane kinematics, the invariants, plane-stress Cauchy and
// nominal stress of an energy built from package terms, the per-term "stress
// columns" (stress is linear in the weights once angles and shape parameters
// are fixed) with their analytic derivatives, and the fitter that learns
// weights, fibre angles and shape parameters from biaxial data.
//
// The conventions below are shared by every weft package and written into
// every model card; comments elsewhere cite them by heading ("see the
// package documentation, Mirror symmetry").
//
// # Angles
//
// The specimen lies in the 1–2 plane; axes 1 and 2 are the tester's loading
// axes, 3 the thickness. A fibre family is the reference unit vector
// a0 = (cos α, sin α, 0), α measured from axis 1 towards axis 2
// (counter-clockwise seen from +3). A fibre has no sign, so α is defined
// modulo 180° and reported in (−90°, 90°] (WrapDeg). Angles are degrees in
// files and cards and radians inside this package; Deg and Rad convert.
//
// # Kinematics
//
// The in-plane deformation gradient F = [[F11, F12], [F21, F22]] is
// completed by F33 = 1/(F11 F22 − F12 F21) (incompressibility, J = 1). A
// pure biaxial stretch has F11 = λ1, F22 = λ2, F12 = F21 = 0. C = FᵀF,
// B = FFᵀ and a = F a0, the pushed-forward fibre (not normalised).
// Symmetric in-plane tensors are stored as (11, 22, 12) (Sym).
//
// # Invariants
//
// I1 = tr C, I2 = ½(I1² − tr C²), I3 = det C = 1; I4 = a0·C a0, the squared
// fibre stretch; I5 = a0·C² a0; and the cofactor-fibre invariant
// K = a0·cof(C) a0 = I5 − I1 I4 + I2 (by Cayley–Hamilton with I3 = 1), the
// squared area stretch normal to the fibre (Spencer 1971; Holzapfel 2000,
// Nonlinear Solid Mechanics, ch. 6; Schröder & Neff 2003). For an
// incompressible material I1 ≥ 3 and I2 ≥ 3, so every shifted argument
// (I1 − 3, I2 − 3, E_f, K − 1, I5 − 1) is zero in the reference state.
//
// # Energy and the fibre switch
//
// Ψ = Σ_k w_k f_k(x_k; θ_k) with weights w_k ≥ 0 in the stress unit and
// shape parameters θ_k (package terms). Fibre shapes start with zero slope,
// f′(0) = 0, so the reference state is stress-free. A family bears load only
// while it is stretched, I4 > 1: otherwise its fibre and I5 terms give no
// energy and no stress (Holzapfel, Gasser & Ogden 2000). Cofactor terms
// switch on their own argument, K > 1, which keeps the energy continuous and
// polyconvex. Both switches take I4 or K within 1e-14 of 1 as not stretched
// (switchRoundOff): at the reference state they come out within a few
// units in the last place of 1, and round-off must not put a term's
// stiffness into the tangent at rest. Convex, non-decreasing shapes of I1, I2, I4 or K with w ≥ 0
// keep the energy polyconvex (Ball 1977; Schröder & Neff 2003); a raw I5
// term does not, and says so. The I4 switch keeps that only where it is
// continuous: for an aligned family (f(0) = f′(0) = 0) and a family spread
// in the plane. With κ > 0 a fibre term's argument is κ(I1 − 3) > 0 where
// I4 crosses 1, and an I5 term's is I5 − 1 > 0 wherever the fibre is
// sheared there, so both energies jump across the switch (switch tests in
// switchjump_test.go).
//
// # Dispersion
//
// A family may carry the three-dimensional dispersion κ of Gasser, Ogden &
// Holzapfel 2006: its fibre terms act on E_f = κ(I1 − 3) + (1 − 3κ)(I4 − 1),
// 0 ≤ κ ≤ 1/3 (κ = 0 an aligned family, κ = 1/3 an isotropic one); without
// dispersion E_f = I4 − 1. The whole family switches on and off with I4.
//
// # In-plane dispersion
//
// A family with a concentration b spreads its fibres over the plane with the
// von Mises density in 2θ, ρ(θ) = exp(b cos 2(θ − α))/(π I0(b)), over one
// period (b = 0: every in-plane direction alike; b → ∞: the ideal family).
// Each of its terms is w ∫ ρ(θ) f(I4(θ) − 1) dθ with a(θ) = (cos θ, sin θ, 0),
// and each direction carries load only while its own I4(θ) > 1 (angular
// integration; Lanir 1983; Sacks 2003). I4(θ) − 1 = ½(C11 + C22) − 1 +
// ½(C11 − C22) cos 2θ + C12 sin 2θ is a trigonometric quadratic in 2θ, so the
// arcs where it is positive are known in closed form (planar.go).
//
// # Plane stress
//
// With ψi = ∂Ψ/∂Ii the Cauchy stress is (Holzapfel 2000, §6.6)
//
//	σ = −p 1 + 2ψ1 B + 2ψ2 (I1 B − B²) + Σ_families [2ψ4 a⊗a + 2ψ5 (a⊗Ba + Ba⊗a)]
//
// A term in K, E_f or an in-plane average enters through the chain rule into
// ψ1, ψ2, ψ4, ψ5. A thin specimen is in plane stress, σ33 = 0; as a has no
// 3-component, p = 2ψ1 B33 + 2ψ2 (I1 B33 − B33²). The nominal (first
// Piola–Kirchhoff) stress is P = σ F⁻ᵀ. Every stress component is linear in
// the weights once angles and shape parameters are fixed, which the fitter
// exploits (variable projection).
//
// # Green strain of the Fung-type term
//
// The Fung-type term of Tong & Fung 1976 is the exception to the invariant
// form: its energy W is a function of the Green strain E = (C2 − 1)/2 of the
// in-plane C2 = F2ᵀF2 in the tester's axes (E11 = (C11 − 1)/2,
// E22 = (C22 − 1)/2, E12 = E21 = C12/2), Q = b1 E11² + b2 E22² +
// 2 b3 E11 E22 + b4 (E12² + E21²), W = w (exp(Q) − 1)/2. As W does not
// depend on C33, σ33 = −p + 2F33² ∂W/∂C33 = −p, so plane stress gives p = 0
// and σ = F2 S F2ᵀ with S = ∂W/∂E (and P = F2 S = ∂W/∂F2, the membrane's own
// gradient); its axes are fixed in the specimen, not a fibre family
// (fung.go).
//
// # Mirror symmetry
//
// Under a pure biaxial stretch (F12 = F21 = 0) a family at +α and one at −α
// give the same normal stresses and opposite shear stresses. From normal
// stresses alone the sign of α cannot be found, and one family at α with
// weight w cannot be told from a mirror pair at ±α with weights w/2 each;
// only shear information (measured F12, F21 or a shear stress,
// Problem.HasShear) breaks the tie. F12 and F21 that stay within their
// point-to-point scatter of zero are tracking noise, not information:
// package biaxial reads them as no shear information
// (Specimen.ShearWithinScatter), and the fit takes F12 = F21 = 0
// (Problem.ShearTakenAsZero), so that the symmetry below holds exactly
// instead of the noise choosing a sign. The fitter says so instead of reporting a
// sign or a second family it cannot know. The loss is then even in each
// family's angle about 0° and 90°: both are stationary points, where its
// slope in the angle vanishes. A refinement slows to a crawl near them, so
// the fitter settles an angle that ends within half a degree of one onto
// it when that is no worse, keeps a start that lies on one there unless
// the loss falls off it, and treats the angle's slope there as zero in
// the covariance (Fit). Two families at independent,
// non-mirror angles are distinguishable from one by normal stresses; a fully
// dispersed family competes with an exponential I1 term, which the fitter
// reports as a correlation. Planar biaxial data constrain the in-plane
// response only: the out-of-plane and I5-dependent response is not fully
// determined by them (Holzapfel & Ogden 2009).
//
// # Where things live
//
// Mechanics: kinematics.go (F, C, the invariants and fibre kinematics),
// model.go (Model, Evaluate, the dispersion κ), planar.go (in-plane
// dispersion), principal.go and fung.go (principal-stretch and
// Green-strain terms), tangent.go, admissible.go (stability scans),
// verify.go (verification load cases), split.go (matrix and fibre shares),
// mirror.go (mirror alternatives), sutured.go (shear under sutures),
// angles.go (Deg, Rad, WrapDeg).
//
// Fitting one form: problem.go (NewProblem), columns.go and engine.go (the
// stress columns and the variable-projection loss), nnls.go, optimize.go
// (Levenberg–Marquardt), scan.go and scanmemo.go (coarse angle starts),
// fit.go (Fit), uncertainty.go, combination.go and profile.go (standard
// errors, correlated combinations, and the angle profiles with their
// profile-likelihood intervals, Result.profiles, AngleProfile; only angles
// are profiled), degenerate.go (terms
// the data do not feel), result.go (Result), predict.go (Predict,
// Metrics), band.go (confidence bands of the model curve), misfit.go (a
// fit's residuals against the data's own point-to-point scatter, and the
// flag where they exceed it, FlagMisfit).
//
// Discovery, Discover in discover.go, runs these stages in turn, each in a
// file named after it: the points it searches on (searchpoints.go,
// searchSubset); the full forms (fullforms.go, fitFullForms); the
// term-subset search (termsubsets.go, searchSubsets, with the shape
// parameters a term has alone, shapeprofile.go) and the refits and
// forward steps it feeds (refits.go, refitSubsets and forwardSteps); the
// best one-family models refitted with a second family of the same kind
// (secondfamily.go, secondFamilyRefits; after the spread variants, the
// same models refitted as a mirror pair, mirrorRefits); the spread
// variants, and the best one-family spread models refitted as a pair
// whose densities may sum to one flat-topped peak (spreadvariants.go,
// planarVariants); the Pareto
// front, the classical presets fitted beside it, and fit quality
// (front.go: paretoFront, comparePresets, candidateMetrics);
// leave-one-protocol-out cross-validation (crossval.go: crossValidate, and
// cvFold, which scores a candidate's held-out error, CVFold.Error); the
// decision (select.go, decide and decideOn: first the family verdict's
// walk over forms, then the pick inside the winning form by the
// one-standard-error rule, oneSE, kept admissible by ensureAdmissible,
// then the verdict, and last orthotropyRule and presetCaution; verdict.go
// writes the verdict up (verdictFor) from the evidence of evidence.go;
// lookalikes.go holds the rules that can leave it undecided,
// lookAlikeRules (with inSampleDisagreement and fibreDisagreement of
// select.go) and architectureTieRule; presetrules.go the classical
// presets' rules, orthotropyRule (a Fung-type preset without fibres that
// fits better; README, "Fibre families: the verdict") and presetCaution
// (a classical preset that fits better), with greenCoupled (Model.HasGreenTerm tells a Fung-type term);
// cautions.go the cautions of fibres along a test axis when the data show
// an untared preload or scattered shear, and of ideal families only);
// the polish on every point, with two free families relabelled in angle
// order first (polish.go, familyorder.go), and a flag where models of
// other forms that predict as well put its one fibre direction elsewhere
// (formangle.go, formAngleFlag). runRefits (fullforms.go) fits a stage's
// refits side by side on workers of pool.go, the package's one pool type
// (scans and profiles size their own). Forms, layouts and presets are named in layout.go and
// formlabels.go. Cohorts (cohort.go, cohortselect.go, cohortpool.go) run
// the search stages on scout specimens; cohortfung.go compares a cohort's
// verdict with the Fung-type presets and its specimens' directions with
// its own. AxisScaleCheck (scalecheck.go)
// rediscovers a specimen with one axis's stress scaled, to show whether
// the verdict depends on the calibration of the test's axes. Test planning: design.go
// (PlanTests), design_candidates.go (candidate tests and their
// extrapolation, designer.candidates), design_info.go (information gain), design_questions.go
// (the questions a test can answer), design_score.go (scores).
package aniso
