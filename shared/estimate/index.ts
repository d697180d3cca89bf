// Estimating's public surface: pure functions, no I/O.
export { buildBillOfMaterials, roundUpTo, type BomSettings, type BomSystem, type BillOfMaterials } from "./bill-of-materials.js";
export { priceEstimate, diffGenerated, type PricedEstimate } from "./pricing.js";
