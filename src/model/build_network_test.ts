/** Cross-table checks of the model stage: one case per diagnostic kind, with its location. */
import { deepStrictEqual as assertEquals, ok as assert } from "node:assert/strict";
import { memorySource, readNetworkTables } from "../ingest/read_network.ts";
import { buildNetwork } from "./build_network.ts";
import { susceptanceUsPerKm } from "./resolve_line_types.ts";
import { TWO_FEEDERS } from "../../tests/fixtures/two_feeders.ts";

async function build(files: Readonly<Record<string, string>>) {
  const tables = await readNetworkTables(memorySource(files));
  const network = buildNetwork(tables.value);
  return { network: network.value, diagnostics: [...tables.diagnostics, ...network.diagnostics] };
}

const edit = (file: string, from: string, to: string) => {
  const text = TWO_FEEDERS[file]!;
  if (!text.includes(from)) throw new Error(`fixture ${file} lacks ${from}`);
  return { ...TWO_FEEDERS, [file]: text.replace(from, to) };
};
/** The fixture's line types with a `model` column, ready for more rows. */
const withModelColumn = () =>
  TWO_FEEDERS["line_types.csv"]!.replace("id,construction,", "id,model,construction,")
    .replace("CAB240,cable", "CAB240,,cable").replace("OH50,overhead", "OH50,,overhead");

Deno.test("buildNetwork() accepts the fixture without diagnostics", async () => {
  const { diagnostics, network } = await build(TWO_FEEDERS);
  assertEquals(diagnostics, []);
  assertEquals(network.lines.length, 9);
  assertEquals(network.taintedBuses, {});
});

const CASES: {
  name: string;
  files: Record<string, string>;
  code: string;
  at: { file: string; line: number; column?: number; field?: string };
  tainted: string[];
}[] = [
  {
    name: "a line naming an unknown bus",
    files: edit("lines.csv", "LA2,A1,A2", "LA2,A1,AZ"),
    code: "ref.unknown",
    at: { file: "lines.csv", line: 3, column: 3, field: "to" },
    tainted: ["a1"],
  },
  {
    name: "a line naming an unknown line type",
    files: edit("lines.csv", "LB2,B1,B2,CAB240", "LB2,B1,B2,CAB999"),
    code: "ref.unknown",
    at: { file: "lines.csv", line: 6, column: 4, field: "type" },
    tainted: ["b1", "b2"],
  },
  {
    name: "a line joining buses of different nominal voltage",
    files: edit("buses.csv", "A2,20,F1,12", "A2,10,F1,12"),
    code: "voltage.mismatch",
    at: { file: "lines.csv", line: 3, column: 3, field: "to" },
    tainted: ["a1", "a2"],
  },
  {
    name: "a grid source whose voltage disagrees with its bus",
    files: edit("grid_sources.csv", "G1,HV,110", "G1,HV,132"),
    code: "voltage.mismatch",
    at: { file: "grid_sources.csv", line: 2, column: 3, field: "nominal_voltage" },
    tainted: ["hv"],
  },
  {
    name: "a transformer winding that disagrees with its bus",
    files: edit("transformers.csv", "T1,HV,BB,40,110,20.5", "T1,HV,BB,40,110,10.5"),
    code: "winding.mismatch",
    at: { file: "transformers.csv", line: 2, column: 6, field: "lv_voltage" },
    tainted: ["hv", "bb"],
  },
  {
    name: "a fuse naming an unknown curve",
    files: edit("switches.csv", "FU1,A2,A4,fuse,closed,,,,K25", "FU1,A2,A4,fuse,closed,,,,K99"),
    code: "ref.unknown",
    at: { file: "switches.csv", line: 4, column: 9, field: "fuse_curve" },
    tainted: ["a2", "a4"],
  },
  {
    name: "a fuse curve whose time rises with current",
    files: edit("fuse_curves.csv", "K25,melt,400,0.1", "K25,melt,400,20"),
    code: "curve.invalid",
    at: { file: "fuse_curves.csv", line: 4 },
    tainted: ["a2", "a4"],
  },
  {
    name: "a relay naming an unknown device",
    files: {
      ...TWO_FEEDERS,
      "relay_stages.csv":
        "relay,device,stage,characteristic,pickup [A],time_multiplier\nR1,CB7,1,iec_standard_inverse,300,0.1\n",
    },
    code: "ref.unknown",
    at: { file: "relay_stages.csv", line: 2, column: 2, field: "device" },
    tainted: [],
  },
  {
    name: "relay stages that name two devices",
    files: {
      ...TWO_FEEDERS,
      "relay_stages.csv":
        "relay,device,stage,characteristic,pickup [A],time_multiplier\nR1,CB1,1,iec_standard_inverse,300,0.1\nR1,CB2,2,instantaneous,3000,\n",
    },
    code: "relay.device",
    at: { file: "relay_stages.csv", line: 3, column: 2, field: "device" },
    tainted: ["bb", "sa1"],
  },
  {
    name: "a generator naming an unknown reactive curve",
    files: {
      ...TWO_FEEDERS,
      "generators.csv":
        "id,bus,kind,rated_power [kVA],active_power [kW],reactive_mode,reactive_curve\nPV1,A2,converter,800,750,volt_var,VV9\n",
    },
    code: "ref.unknown",
    at: { file: "generators.csv", line: 2, column: 7, field: "reactive_curve" },
    tainted: ["a2"],
  },
  {
    name: "a reactive curve whose x does not rise",
    files: {
      ...TWO_FEEDERS,
      "reactive_curves.csv":
        "curve,kind,point,x,y\nVV1,volt_var,1,0.92,0.44\nVV1,volt_var,2,0.90,0\n",
      "generators.csv":
        "id,bus,kind,rated_power [kVA],active_power [kW],reactive_mode,reactive_curve\nPV1,A2,converter,800,750,volt_var,VV1\n",
    },
    code: "curve.invalid",
    at: { file: "reactive_curves.csv", line: 3 },
    tainted: ["a2"],
  },
  {
    name: "a matrix line type with an incomplete matrix",
    files: {
      ...TWO_FEEDERS,
      "line_types.csv": withModelColumn() + "M3,matrix,overhead,,,,,,200\n",
      "line_type_matrix.csv":
        "type,row,col,r [ohm/km],x [ohm/km]\nM3,a,a,0.3,0.8\nM3,b,b,0.3,0.8\n",
      "lines.csv": TWO_FEEDERS["lines.csv"]!.replace("LA3,A2,A3,OH50,2.5,A", "LA3,A2,A3,M3,2.5,AB"),
    },
    code: "linetype.matrix",
    at: { file: "line_types.csv", line: 4 },
    tainted: ["a2", "a3"],
  },
  {
    name: "an asymmetric phase matrix",
    files: {
      ...TWO_FEEDERS,
      "line_types.csv": withModelColumn() + "M2,matrix,overhead,,,,,,200\n",
      "line_type_matrix.csv":
        "type,row,col,r [ohm/km],x [ohm/km]\nM2,a,a,0.3,0.8\nM2,a,b,0.1,0.4\nM2,b,a,0.1,0.5\nM2,b,b,0.3,0.8\n",
      "lines.csv": TWO_FEEDERS["lines.csv"]!.replace("LA3,A2,A3,OH50,2.5,A", "LA3,A2,A3,M2,2.5,AB"),
    },
    code: "linetype.matrix",
    at: { file: "line_type_matrix.csv", line: 4 },
    tainted: ["a2", "a3"],
  },
  {
    name: "a generator whose reactive mode does not fit its curve",
    files: {
      ...TWO_FEEDERS,
      "reactive_curves.csv":
        "curve,kind,point,x,y\nPF1,power_factor_of_p,1,0.5,1\nPF1,power_factor_of_p,2,1.0,0.9\n",
      "generators.csv":
        "id,bus,kind,rated_power [kVA],active_power [kW],reactive_mode,reactive_curve\nPV1,A2,converter,800,750,volt_var,PF1\n",
    },
    code: "curve.kind",
    at: { file: "generators.csv", line: 2, column: 7, field: "reactive_curve" },
    tainted: ["a2"],
  },
  {
    name: "a geometry line type whose conductors overlap",
    files: {
      ...TWO_FEEDERS,
      "line_types.csv": withModelColumn() + "G1,geometry,overhead,,,,,,200\n",
      "conductors.csv": "id,resistance [ohm/km],gmr [mm],diameter [mm]\nAL50,0.6,2.5,9\n",
      "line_geometry.csv": "type,position,conductor,x [m],y [m]\nG1,a,AL50,0,9\nG1,b,AL50,0,9\n",
      "lines.csv": TWO_FEEDERS["lines.csv"]!.replace("LA3,A2,A3,OH50,2.5,A", "LA3,A2,A3,G1,2.5,AB"),
    },
    code: "linetype.geometry",
    at: { file: "line_types.csv", line: 4 },
    tainted: ["a2", "a3"],
  },
  {
    name: "a line whose phases do not match its type's conductors",
    files: {
      ...TWO_FEEDERS,
      "line_types.csv": withModelColumn() + "M1,matrix,overhead,,,,,,200\n",
      "line_type_matrix.csv": "type,row,col,r [ohm/km],x [ohm/km]\nM1,a,a,0.3,0.8\n",
      "lines.csv": TWO_FEEDERS["lines.csv"]!.replace("LA3,A2,A3,OH50,2.5,A", "LA3,A2,A3,M1,2.5,AB"),
    },
    code: "phase.count",
    at: { file: "lines.csv", line: 4, column: 6, field: "phases" },
    tainted: ["a2", "a3"],
  },
];

for (const c of CASES) {
  Deno.test(`buildNetwork() reports ${c.name}`, async () => {
    const { diagnostics, network } = await build(c.files);
    const d = diagnostics.find((d) => d.code === c.code);
    assert(d, `expected ${c.code} among ${diagnostics.map((d) => d.code).join(", ")}`);
    assertEquals(d.severity, "error");
    assertEquals(d.at, c.at);
    for (const b of c.tainted) assert(network.taintedBuses[b], `bus ${b} is tainted`);
  });
}

Deno.test("buildNetwork() reads a matrix line type and maps it to the type's phases", async () => {
  const files = {
    ...TWO_FEEDERS,
    "line_types.csv": withModelColumn() + "M2,matrix,overhead,,,,,,200\n",
    "line_type_matrix.csv":
      "type,row,col,r [ohm/km],x [ohm/km],b [uS/km]\nM2,a,a,0.40,0.90,3\nM2,a,c,0.10,0.35,-1\nM2,c,c,0.41,0.88,3\n",
  };
  const { diagnostics, network } = await build(files);
  assertEquals(diagnostics, []);
  const m2 = network.lineTypes.find((t) => t.id === "M2")!;
  assertEquals(m2.zPhase.phases, "AC");
  assertEquals([...m2.zPhase.re], [0.40, 0.10, 0.10, 0.41]);
  assertEquals([...m2.bPhase.im], [3, -1, -1, 3]);
});

Deno.test("susceptanceUsPerKm() is ωC", () => {
  // b = 2π·f·C: 300 nF/km at 50 Hz is 94.25 µS/km (definition of capacitive susceptance).
  const b = susceptanceUsPerKm(300, 50);
  assert(Math.abs(b - 2 * Math.PI * 50 * 300e-9 * 1e6) < 1e-12);
  assert(Math.abs(b - 94.2478) < 1e-4);
});

Deno.test("buildNetwork() converts capacitance columns to susceptance with the network frequency", async () => {
  const files = { ...TWO_FEEDERS, "settings.csv": "company,frequency [Hz]\nTest Grid Co,60\n" };
  const { network } = await build(files);
  const cab = network.lineTypes.find((t) => t.id === "CAB240")!;
  assert(Math.abs(cab.b1UsPerKm - 2 * Math.PI * 60 * 300e-3) < 1e-9);
  assertEquals(network.settings, {
    company: "Test Grid Co",
    frequencyHz: 60,
    earthResistivityOhmM: 100,
  });
});

Deno.test("buildNetwork() warns that rows of settings.csv after the first are ignored", async () => {
  const { diagnostics } = await build({
    ...TWO_FEEDERS,
    "settings.csv": "company,frequency [Hz]\nA,50\nB,60\n",
  });
  assertEquals(
    diagnostics.map((d) => [d.code, d.severity, d.at]),
    [["table.rows", "warning", { file: "settings.csv", line: 3 }]],
  );
});
