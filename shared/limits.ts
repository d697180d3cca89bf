// Numeric limits used by both the schemas and the inputs that feed them.

/** Largest JSON request body the API accepts (bytes); uploads have their own limits. */
export const MAX_JSON_BODY_BYTES = 1024 * 1024;

export const CompanyLimits = {
  maxNameLength: 200,
} as const;
