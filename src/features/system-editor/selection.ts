// What is selected in the System editor: one element of the network. The entry tables, the
// one-line diagram and the results share it, so selecting in one selects in the others.
export type ElementKind = "point" | "run" | "source" | "load" | "case";

export interface Selection {
  kind: ElementKind;
  id: string;
}

export const sameSelection = (a: Selection | null, b: Selection | null) => a?.kind === b?.kind && a?.id === b?.id;
