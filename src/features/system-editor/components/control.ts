import { controlClass } from "../../../components/ui/form";

/** The form control look without the full width, for controls that sit in a row (the width is given beside it). */
export const inlineControlClass = controlClass.replace("w-full", "w-auto");
