/**
 * Response curves (`responseCurve`) and marginal returns at a plan. Pure and isomorphic: no I/O,
 * no `server-only`. See README.md.
 */
export { responseCurve, responseCurves, curveGrid } from "./response-curve";
export { marginalReturn, marginalReturnCaution, type MarginalReturnInput } from "./marginal-return";
export type { MarginalReturn, ResponseCurve, ResponseCurveInput, ResponseCurvePoint } from "./types";
