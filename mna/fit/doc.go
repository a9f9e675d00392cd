// Package fit turns the data engineers have — TLP curves, datasheet points,
// impedance curves and Touchstone files — into the parameters of zapnet's
// device models (MODELS.md), and says how well the model reproduces each
// point.
//
// Every fit is a nonlinear least-squares problem solved by Minimize
// (gonum's optimize with the Gauss–Newton Hessian, see there) over the
// logarithms of the model's positive parameters, so a parameter cannot
// change sign and every decade weighs alike. Residuals are relative, so
// that a point at 10 mΩ and one at 1 kΩ count alike:
//
//   - bead, complex data: (Z_model − Z_data)/|Z_data|, its real and
//     imaginary parts as two residuals (fitting |Z| or R alone cannot tell
//     the resistive part from the reactive one, and misleads);
//   - bead, magnitudes only: (|Z_model| − |Z_data|)/|Z_data|;
//   - clamp and snapback clamp: (V_model(I) − V_data)/V_data at the data's
//     current, V_model being the quasi-static voltage of MODELS.md's
//     equations; a clamping voltage published for a named pulse (8/20,
//     10/1000, TLP) is the peak (surges) or the 70–90 % average (TLP) of
//     that pulse simulated through the engine (see Runner), not a static
//     guess.
//
// The standard errors reported beside each parameter come from the
// Jacobian at the solution (see Result.Sigma).
package fit
