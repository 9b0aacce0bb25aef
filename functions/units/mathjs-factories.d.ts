// mathjs exports a factory for each of its types and functions; its type declarations leave most
// of them out. These are the ones functions/units/mathjs.ts builds its unit-only instance from.
import type { FactoryFunction } from "mathjs";

declare module "mathjs" {
  export const createAbs: FactoryFunction<unknown>;
  export const createAddScalar: FactoryFunction<unknown>;
  export const createComplexClass: FactoryFunction<unknown>;
  export const createCreateUnit: FactoryFunction<unknown>;
  export const createDivideScalar: FactoryFunction<unknown>;
  export const createFormat: FactoryFunction<unknown>;
  export const createFractionClass: FactoryFunction<unknown>;
  export const createIsNumeric: FactoryFunction<unknown>;
  export const createMultiplyScalar: FactoryFunction<unknown>;
  export const createNumber: FactoryFunction<unknown>;
  export const createNumeric: FactoryFunction<unknown>;
  export const createSubtractScalar: FactoryFunction<unknown>;
  export const createTyped: FactoryFunction<unknown>;
  export const createUnitClass: FactoryFunction<unknown>;
  export const createUnitFunction: FactoryFunction<unknown>;
}
