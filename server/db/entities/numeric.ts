import type { ValueTransformer } from "typeorm";

// pg returns numeric columns as strings ("12.50"); settings such as percentages
// are read as numbers. Money never goes through here: it is kept in integer
// minor units.
export const numericAsNumber: ValueTransformer = {
  to: (value: number | null | undefined) => value,
  from: (value: string | null) => (value === null ? null : Number(value)),
};
