import { describe, expect, it } from "vitest";
import { failure, run } from "./helpers";

describe("defects found on the way stay fixed", () => {
  it.each(["constructor", "__proto__", "toString", "hasOwnProperty", "valueOf"])("a name such as %s picks no table entry: #VALUE! naming the argument", (name) => {
    expect(failure("PIPE.ROUGHNESS", name)).toMatchObject({ kind: "value", arg: "material" });
    expect(failure("FITTING.K", name, 0.1)).toMatchObject({ kind: "value", arg: "fitting" });
    expect(failure("PIPE.ID", name, 40)).toMatchObject({ kind: "value", arg: "nps" });
    expect(failure("PIPE.ID", 6, name)).toMatchObject({ kind: "value", arg: "schedule" });
  });
  it("SYSTEM.HEAD with a viscosity of zero or below names its own kinematic_viscosity argument", () => {
    for (const nu of [0, -1e-6]) expect(failure("SYSTEM.HEAD", 0.01, 10, [[100, 0.1, 0.0001]], nu)).toMatchObject({ kind: "num", arg: "kinematic_viscosity" });
  });
  it("a unit of no known dimension reads plainly", () => {
    expect(failure("HEAD", "1 kg").message).toBe('pressure: "kg" is not a pressure unit: expected something like "35 psi"');
  });
});

describe("messages quote values in the units the user gave", () => {
  const family = [
    ["Impeller (in)", "Flow (gpm)", "Head (ft)"],
    [9, 0, 105], [9, 200, 95], [9, 420, 65],
    [10, 0, 115], [10, 200, 105], [10, 420, 75],
  ];
  it("a duty flow beyond every impeller, in gpm (the family's header unit)", () => {
    expect(failure("PUMP.SELECT", family, "500 gpm", "50 ft").message).toBe("flow: 500 gpm is outside every impeller's curve in the family (the largest reaches 420 gpm)");
  });
  it("a duty head no impeller reaches, in ft", () => {
    expect(failure("PUMP.SELECT", family, "200 gpm", "130 ft").message).toBe("head: no impeller in the family gives 130 ft at 200 gpm; the largest gives 105 ft");
  });
  it("a flow beyond a curve, in the curve's header unit", () => {
    expect(failure("PUMP.HEAD", "450 gpm", [["Flow (gpm)", "Head (ft)"], [0, 100], [200, 92], [400, 60]]).message).toBe("flow: 450 gpm is outside the head curve (0 gpm to 400 gpm); values are never extrapolated");
  });
  it("a velocity warning in the base unit when the flow was given as a bare number", () => {
    expect(run("HEADLOSS", 0.1, 0.15, 10, 4.5e-5).warnings[0]).toMatch(/^Velocity 5\.659 m\/s is above the 3 m\/s/);
  });
});

describe("bad input gives a worksheet error naming the argument", () => {
  it("wrong dimension is #VALUE!", () => {
    const e = failure("VELOCITY", "100 gpm", "35 psi");
    expect([e.kind, e.arg]).toEqual(["value", "diameter"]);
    expect(e.message).toMatch(/pressure unit, not a length/);
  });
  it("unknown unit is #VALUE!", () => {
    const e = failure("HEAD", "12 furlongs");
    expect([e.kind, e.arg]).toEqual(["value", "pressure"]);
  });
  it("negative or zero diameter is #NUM!", () => {
    expect(failure("VELOCITY", 0.01, -0.1)).toMatchObject({ kind: "num", arg: "diameter" });
    expect(failure("VELOCITY", 0.01, 0)).toMatchObject({ kind: "num", arg: "diameter" });
  });
  it("efficiency given as 80 is #NUM!, never divided by 100", () => {
    const e = failure("POWER.SHAFT", 0.05, 30, 80);
    expect([e.kind, e.arg]).toEqual(["num", "efficiency"]);
    expect(e.message).toMatch(/"78%"/);
    expect(failure("POWER.SHAFT", 0.05, 30, "80")).toMatchObject({ kind: "num", arg: "efficiency" });
  });
  it("efficiency as percent text is accepted", () => {
    expect(run("POWER.SHAFT", 0.05, 30, "80%", 1000).value).toBeCloseTo((1000 * 9.80665 * 0.05 * 30) / 0.8, 9);
  });
  it("non-numeric text is #VALUE!", () => {
    expect(failure("REYNOLDS", "lots", 0.1)).toMatchObject({ kind: "value", arg: "flow" });
  });
  it("booleans are #VALUE!", () => {
    expect(failure("HEAD", true)).toMatchObject({ kind: "value", arg: "pressure" });
  });
  it("water above its boiling point at the given pressure is #NUM! naming temperature", () => {
    const e = failure("WATER.DENSITY", 105, "1 atm");
    expect([e.kind, e.arg]).toEqual(["num", "temperature"]);
    expect(e.message).toMatch(/boils at/);
  });
  it("a missing required argument is #VALUE!", () => {
    expect(failure("HEADLOSS", 0.01, 0.1, null, 4.5e-5)).toMatchObject({ kind: "value", arg: "length" });
  });
  it("an unknown option is #VALUE! listing the options", () => {
    const e = failure("FRICTION", 1e5, 1e-4, "moody");
    expect(e.arg).toBe("method");
    expect(e.message).toMatch(/"colebrook", "swamee-jain", "haaland", "churchill"/);
  });
  it("an output unit of the wrong dimension is #VALUE! naming unit", () => {
    expect(failure("HEADLOSS", 0.01, 0.1, 100, 4.5e-5, null, "psi")).toMatchObject({ kind: "value", arg: "unit" });
  });
  it("an output unit on a dimensionless result is #VALUE!", () => {
    expect(failure("AFFINITY", 10, "head", 1.1, "rpm")).toMatchObject({ kind: "value", arg: "unit" });
  });
  it("AFFINITY checks the value's unit against the kind", () => {
    expect(failure("AFFINITY", "100 gpm", "head", 0.9)).toMatchObject({ kind: "value", arg: "value" });
  });
  it("a jet cannot land higher than it rises", () => {
    expect(failure("JET.REACH", 5, 45, -10)).toMatchObject({ kind: "num", arg: "drop" });
  });
  it("a range where one value is expected is #VALUE!", () => {
    expect(failure("HEAD", [[1, 2]])).toMatchObject({ kind: "value", arg: "pressure" });
    expect(run("HEAD", [[9806.65]], 1000).value).toBeCloseTo(1, 12);
  });
  it("very long text is #VALUE!", () => {
    expect(failure("HEAD", "1".repeat(10000) + " psi")).toMatchObject({ kind: "value", arg: "pressure" });
  });
  it("too many arguments is #VALUE!", () => {
    expect(failure("HEAD", 1, 1000, "m", 4)).toMatchObject({ kind: "value" });
  });
});

describe("optional arguments and output units", () => {
  it("uses water at 20 °C when density is left out", () => {
    expect(run("HEAD", 9806.65).readings.find((r) => r.name === "density")).toMatchObject({ how: "default" });
  });
  it("NPSHA defaults the density to water at the given temperature", () => {
    const hot = run("NPSHA", 101325, 2, 0.5, 80).readings.find((r) => r.name === "density");
    expect(hot?.value).toBeCloseTo(971.8, 0); // IF97 at 80 °C, 1 atm (steam tables: 971.8 kg/m³; from memory)
  });
  it("records how each argument was read", () => {
    const r = run("VELOCITY", "400 gpm", 0.1, "ft/s");
    expect(r.readings.map((x) => [x.name, x.how, x.unit])).toEqual([
      ["flow", "text quantity", "gpm"],
      ["diameter", "base unit", "m"],
      ["unit", "unit name", ""],
    ]);
    expect(r.unit).toBe("ft/s");
  });
  it("treats empty text like a skipped optional", () => {
    expect(run("HEAD", 9806.65, "", "").value).toBe(run("HEAD", 9806.65).value);
  });
});

describe("never NaN or Infinity", () => {
  it("gives zero loss at zero flow rather than 0/0", () => {
    expect(run("HEADLOSS", 0, 0.1, 100, 4.5e-5).value).toBe(0);
  });
  it("returns an error, not Infinity, for overflowing results", () => {
    expect(failure("POWER.HYDRAULIC", 1e300, 1e300)).toMatchObject({ kind: "num" });
  });
});
