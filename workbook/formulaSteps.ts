/**
 * The formula library's evaluation modules (fast-formula-parser's operators, helpers and function
 * library), which load without its parser and Chevrotain. workbook/formulaEvaluator.ts runs the
 * fast front end's formulas with them; formulaLibrary.ts and its twins hand them out.
 */
import { Address, FormulaHelpers } from "fast-formula-parser/formulas/helpers";
import { Infix, Operators, Postfix, Prefix } from "fast-formula-parser/formulas/operators";
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

export const STEPS = { FormulaHelpers, Address, Infix, Prefix, Postfix, Operators, functions: { date, engineering, information, logical, math, reference, statistical, text, trigonometry, web } };
export type LibrarySteps = typeof STEPS;
