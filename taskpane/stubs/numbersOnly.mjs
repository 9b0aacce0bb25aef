/**
 * Stand-in for decimal.js, complex.js and fraction.js in the shipped bundles. Nappe's one mathjs
 * instance (functions/units/mathjs.ts) works on plain numbers only: it never makes a BigNumber,
 * a Complex or a Fraction, yet mathjs's unit factory defines those classes (and a few modules
 * make a constant of one when they load). This class lets the factories run; it has none of
 * the libraries' arithmetic, so any real use fails at once. The Node tests run on the real
 * libraries, and test/safety.test.ts runs every catalogue example through the built bundle.
 */
class NumbersOnly {
  constructor(value) {
    this.value = value;
  }
  static clone() {
    return class extends NumbersOnly {};
  }
  static config() {
    return NumbersOnly;
  }
}
NumbersOnly.EUCLID = 9;
export default NumbersOnly;
export { NumbersOnly as Decimal, NumbersOnly as Complex, NumbersOnly as Fraction };
