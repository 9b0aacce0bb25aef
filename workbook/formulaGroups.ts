/** The formula library's function groups, all loaded (the tests, the scripts, the pane's formula chunk). */
import date from "fast-formula-parser/formulas/functions/date";
import engineering from "fast-formula-parser/formulas/functions/engineering";
import information from "fast-formula-parser/formulas/functions/information";
import logical from "fast-formula-parser/formulas/functions/logical";
import math from "fast-formula-parser/formulas/functions/math";
import reference from "fast-formula-parser/formulas/functions/reference";
import statistical from "fast-formula-parser/formulas/functions/statistical";
import text from "fast-formula-parser/formulas/functions/text";
import trigonometry from "fast-formula-parser/formulas/functions/trigonometry";
import web from "fast-formula-parser/formulas/functions/web";
import type { FunctionGroup } from "./formulaFunctions";
import { librarySteps, type LibraryFunctions, type LibrarySteps } from "./formulaSteps";

const GROUPS: Record<FunctionGroup, LibraryFunctions> = { date, engineering, information, logical, math, reference, statistical, text, trigonometry, web };

export const STEPS: LibrarySteps = librarySteps((name) => GROUPS[name]);
