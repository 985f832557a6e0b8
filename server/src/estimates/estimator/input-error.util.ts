/**
 * Invalid estimate input. `field` is the request path of the bad value (e.g. `assessment.gagReflex`,
 * `facts.curvatureDegrees`, `tooth`) so the API can answer 400 naming it.
 */
export class EstimateInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`);
    this.name = 'EstimateInputError';
  }
}
