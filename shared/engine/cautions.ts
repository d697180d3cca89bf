// The cautions every result, quote and cut list carries (DESIGN.md §5), in our own words.
export const CAUTIONS: readonly string[] = [
  "Battery banks can deliver thousands of amperes into a fault. Fuse every positive conductor close to the battery, with a fuse rated to interrupt the available fault current.",
  "Check each conductor's ampacity and insulation temperature rating for the way it is installed (bundling, conduit, ambient temperature, engine rooms).",
  "These results are design aids. They do not replace the locally adopted electrical code, the equipment manufacturers' instructions, or the judgement of a licensed professional.",
];
