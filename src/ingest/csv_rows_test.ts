import { deepStrictEqual, equal, ok as assert } from "node:assert/strict";
import { fileURLToPath } from "node:url";
import { type CsvRow, parseCsvChunks, parseCsvText, streamCsvFile } from "./csv_rows.ts";

// Sources used below:
// [RFC 4180] Common Format and MIME Type for CSV Files: records end in CRLF (LF is
//   accepted in practice); a field in double quotes may contain line breaks, commas and
//   doubled quotes ("") [memory].
// [Unicode] The Unicode Standard, ch. 3 / ch. 23: U+FEFF at the start of a UTF-8 text is
//   a byte order mark, not content; UTF-8 encodes U+00FC "ü" as C3 BC, U+20AC "€" as
//   E2 82 AC and U+1F50C as F0 9F 94 8C [memory].

function rowsOf(rows: readonly CsvRow[]): [number, readonly string[]][] {
  return rows.map((r) => [r.line, r.cells]);
}

async function collect(chunks: AsyncIterable<string> | Iterable<string>) {
  const rows: CsvRow[] = [];
  const problems = await parseCsvChunks(chunks, (r) => rows.push(r));
  return { rows, problems };
}

interface LineCase {
  readonly name: string;
  readonly text: string;
  readonly rows: [number, string[]][];
}

// Line numbers are what a text editor shows: 1-based, counting every line break of the
// file, including those inside quoted fields (RFC 4180) and blank lines.
const LINE_CASES: readonly LineCase[] = [
  {
    name: "LF file, a quoted field spanning two lines",
    text: 'id,name\n1,"a\nb"\n2,c\n',
    rows: [[1, ["id", "name"]], [2, ["1", "a\nb"]], [4, ["2", "c"]]],
  },
  {
    name: "CRLF file, a quoted field spanning two lines",
    text: 'id,name\r\n1,"a\r\nb"\r\n2,c\r\n',
    rows: [[1, ["id", "name"]], [2, ["1", "a\r\nb"]], [4, ["2", "c"]]],
  },
  {
    name: "LF file, a quoted field spanning four lines, then two more rows",
    text: 'id,name\n1,"a\n\nb\nc"\n2,d\n3,e\n',
    rows: [[1, ["id", "name"]], [2, ["1", "a\n\nb\nc"]], [6, ["2", "d"]], [7, ["3", "e"]]],
  },
  {
    name: "CRLF file, two multi-line fields in one row",
    text: 'id,a,b\r\n1,"x\r\ny","p\r\nq\r\nr"\r\n2,s,t\r\n',
    rows: [[1, ["id", "a", "b"]], [2, ["1", "x\r\ny", "p\r\nq\r\nr"]], [6, ["2", "s", "t"]]],
  },
  {
    name: "blank and space-only lines are skipped but counted",
    text: "id,name\n\n1,a\n   \n\n2,b\n",
    rows: [[1, ["id", "name"]], [3, ["1", "a"]], [6, ["2", "b"]]],
  },
  {
    name: "blank lines in a CRLF file, before the header too",
    text: "\r\n\r\nid,name\r\n1,a\r\n\r\n2,b\r\n",
    rows: [[3, ["id", "name"]], [4, ["1", "a"]], [6, ["2", "b"]]],
  },
  {
    name: "a line of empty fields is a row, not a blank line",
    text: "id,name\n,\n1,a\n",
    rows: [[1, ["id", "name"]], [2, ["", ""]], [3, ["1", "a"]]],
  },
  {
    name: "no line break after the last row",
    text: "id,name\n1,a",
    rows: [[1, ["id", "name"]], [2, ["1", "a"]]],
  },
  {
    name: "commas and doubled quotes inside quoted fields (RFC 4180)",
    text: 'id,name\n1,"a, ""b"""\n',
    rows: [[1, ["id", "name"]], [2, ["1", 'a, "b"']]],
  },
];

Deno.test("parseCsvText() gives each row the line where it starts", async () => {
  for (const c of LINE_CASES) {
    const { rows, problems } = await parseCsvText(c.text);
    deepStrictEqual(rowsOf(rows), c.rows, c.name);
    deepStrictEqual(problems, [], c.name);
  }
});

Deno.test(
  "parseCsvText() counts line breaks inside quoted fields of a CR-only file",
  () => {
    // Regression: papaparse also accepts bare "\r" line endings (old Mac files); a bare CR
    // inside a quoted field must count as a line break, or later rows come out one line
    // too early (row "2" below is on line 4).
    return parseCsvText('id,name\r1,"a\rb"\r2,c\r').then(({ rows }) => {
      deepStrictEqual(rowsOf(rows), [[1, ["id", "name"]], [2, ["1", "a\rb"]], [4, ["2", "c"]]]);
    });
  },
);

Deno.test("parseCsvText() removes the byte order mark from the first cell", async () => {
  // Unicode: a leading U+FEFF is a byte order mark, not part of the first header name.
  const cases: readonly { name: string; text: string; rows: [number, string[]][] }[] = [
    {
      name: "BOM before the header",
      text: "\uFEFFid,name\n1,a\n",
      rows: [[1, ["id", "name"]], [2, ["1", "a"]]],
    },
    {
      name: "BOM in a CRLF file",
      text: "\uFEFFid,name\r\n1,a\r\n",
      rows: [[1, ["id", "name"]], [2, ["1", "a"]]],
    },
    {
      name: "BOM then a blank line: the blank line is still skipped and counted",
      text: "\uFEFF\nid,name\n1,a\n",
      rows: [[2, ["id", "name"]], [3, ["1", "a"]]],
    },
  ];
  for (const c of cases) {
    const { rows, problems } = await parseCsvText(c.text);
    deepStrictEqual(rowsOf(rows), c.rows, c.name);
    deepStrictEqual(problems, [], c.name);
    assert(!rows.some((r) => r.cells.some((x) => x.includes("\uFEFF"))), c.name);
  }
});

Deno.test(
  "parseCsvText() reads a quoted first header cell after a byte order mark",
  async () => {
    // Regression: the BOM must go before papaparse splits the row; otherwise papaparse sees
    // U+FEFF before the opening quote and the first cell comes out as the literal text
    // "\"id\"". Exporters that quote every field and write a BOM produce exactly this
    // (common practice).
    const { rows, problems } = await parseCsvText('\uFEFF"id","name"\n"1","a"\n');
    deepStrictEqual(rowsOf(rows), [[1, ["id", "name"]], [2, ["1", "a"]]]);
    deepStrictEqual(problems, []);
  },
);

Deno.test("parseCsvText() reports an unclosed quote as a problem on its row's line", async () => {
  // RFC 4180: a field that starts with a quote must end with one; here the quote opened
  // on line 3 never closes, so the rest of the file is one field.
  const cases = [
    {
      name: "LF",
      text: 'id,name\n1,a\n2,"b\n3,c\n',
      problemLines: [3],
      rowLines: [1, 2, 3],
    },
    {
      name: "CRLF, after a multi-line field and a blank line",
      text: 'id,name\r\n1,"x\r\ny"\r\n\r\n2,"b\r\n3,c\r\n',
      problemLines: [5],
      rowLines: [1, 2, 5],
    },
  ];
  for (const c of cases) {
    const { rows, problems } = await parseCsvText(c.text);
    deepStrictEqual(problems.map((p) => p.line), c.problemLines, c.name);
    for (const p of problems) equal(p.message, "a quoted field is not closed", c.name);
    deepStrictEqual(rows.map((r) => r.line), c.rowLines, c.name);
  }
});

Deno.test("parseCsvChunks() keeps a character whole when text chunks split a row", async () => {
  const cases: readonly { name: string; chunks: string[] }[] = [
    { name: "character alone in the middle chunk", chunks: ["id,name\n1,Gr", "ü", "n\n"] },
    { name: "split right after the character", chunks: ["id,name\n1,Grü", "n\n"] },
    { name: "split inside the header", chunks: ["id,na", "me\n1,Grün\n"] },
    { name: "one character per chunk", chunks: [..."id,name\n1,Grün\n"] },
  ];
  for (const c of cases) {
    const { rows, problems } = await collect(c.chunks);
    deepStrictEqual(rowsOf(rows), [[1, ["id", "name"]], [2, ["1", "Grün"]]], c.name);
    deepStrictEqual(problems, [], c.name);
  }
});

Deno.test("parseCsvChunks() keeps lines right when a quoted field spans chunks", async () => {
  const chunks = ['id,name\n1,"a', '\nb"\n\n2,', "c\n"];
  const { rows, problems } = await collect(chunks);
  deepStrictEqual(rowsOf(rows), [[1, ["id", "name"]], [2, ["1", "a\nb"]], [5, ["2", "c"]]]);
  deepStrictEqual(problems, []);
});

Deno.test(
  "parseCsvChunks() gives the same cells however a CRLF file is chunked",
  async () => {
    // Regression: papaparse guesses the line ending from its first chunk; parseCsvChunks
    // holds text back until the first line break so that the cells of a CRLF file do not
    // depend on the chunking (no "\r" left on the last cell).
    const whole = await collect(["id,name\r\n1,x\r\n2,y\r\n"]);
    const split = await collect(["id,na", "me\r\n1,x\r\n2,y\r\n"]);
    deepStrictEqual(rowsOf(split.rows), rowsOf(whole.rows));
  },
);

/** Bytes of `text` cut at the given byte offsets, as a stream of chunks. */
function byteChunks(text: string, cuts: readonly number[]): ReadableStream<Uint8Array> {
  const bytes = new TextEncoder().encode(text);
  const chunks: Uint8Array[] = [];
  let from = 0;
  for (const cut of [...cuts, bytes.length]) {
    chunks.push(bytes.slice(from, cut));
    from = cut;
  }
  return ReadableStream.from(chunks);
}

Deno.test("parseCsvChunks() reads bytes split mid-character through a TextDecoderStream", async () => {
  const text = "id,name\n1,Grün\n2,€\n3,\u{1F50C}\n";
  const bytes = new TextEncoder().encode(text);
  // Unicode: ü = C3 BC, € = E2 82 AC, U+1F50C = F0 9F 94 8C; cut inside each of them.
  const u = bytes.indexOf(0xc3), e = bytes.indexOf(0xe2), p = bytes.indexOf(0xf0);
  equal(bytes[u + 1], 0xbc);
  const cuts = [u + 1, e + 1, e + 2, p + 1, p + 3];
  // The cuts really break characters: decoding each chunk alone gives U+FFFD.
  const naive = [];
  for await (const chunk of byteChunks(text, cuts)) naive.push(new TextDecoder().decode(chunk));
  assert(naive.join("").includes("\uFFFD"), "the cuts must fall inside characters");

  const decoded = byteChunks(text, cuts).pipeThrough(new TextDecoderStream("utf-8"));
  const { rows, problems } = await collect(decoded);
  deepStrictEqual(rowsOf(rows), [
    [1, ["id", "name"]],
    [2, ["1", "Grün"]],
    [3, ["2", "€"]],
    [4, ["3", "\u{1F50C}"]],
  ]);
  deepStrictEqual(problems, []);
});

const TMP_ROOT = fileURLToPath(new URL("../../reports/.test-tmp/", import.meta.url));

/** Runs `body` with a fresh folder under reports/.test-tmp, removed afterwards. */
async function withTempDir(body: (dir: string) => Promise<void>): Promise<void> {
  await Deno.mkdir(TMP_ROOT, { recursive: true });
  const dir = await Deno.makeTempDir({ dir: TMP_ROOT, prefix: "csv_rows_" });
  try {
    await body(dir);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

Deno.test("streamCsvFile() streams a file with BOM, CRLF and multi-line fields", async () => {
  await withTempDir(async (dir) => {
    const path = await Deno.makeTempFile({ dir, suffix: ".csv" });
    const text = '\uFEFFid,name\r\n\r\nA1,"Grün\r\nweg"\r\nA2,Öl €\r\n';
    await Deno.writeTextFile(path, text);
    const rows: CsvRow[] = [];
    const problems = await streamCsvFile(path, (r) => rows.push(r));
    deepStrictEqual(rowsOf(rows), [
      [1, ["id", "name"]],
      [3, ["A1", "Grün\r\nweg"]],
      [5, ["A2", "Öl €"]],
    ]);
    deepStrictEqual(problems, []);
  });
});

Deno.test("streamCsvFile() keeps characters whole across the file's read chunks", async () => {
  // A file of about 400 kB, mostly "€" (3 bytes in UTF-8). Whatever the read chunk size
  // is (a power of two, not a multiple of 3), chunk boundaries fall inside characters.
  const long = "€".repeat(20_000); // 60 000 bytes per field
  const lines = ["id,text"];
  for (let i = 1; i <= 6; i++) lines.push(`R${i},"${long}\n${"ü".repeat(i)}"`);
  lines.push("END,done");
  const text = lines.join("\n") + "\n";
  // The fixture is meaningful: with 64 KiB reads (Deno's read size at the time of
  // writing) several boundaries land on a UTF-8 continuation byte (10xxxxxx, Unicode).
  const bytes = new TextEncoder().encode(text);
  let split = 0;
  for (let b = 65536; b < bytes.length; b += 65536) if ((bytes[b]! & 0xc0) === 0x80) split++;
  assert(split >= 1, `only ${split} boundaries inside characters`);
  await withTempDir(async (dir) => {
    const path = await Deno.makeTempFile({ dir, suffix: ".csv" });
    await Deno.writeTextFile(path, text);
    const rows: CsvRow[] = [];
    const problems = await streamCsvFile(path, (r) => rows.push(r));
    deepStrictEqual(problems, []);
    equal(rows.length, 8);
    for (let i = 1; i <= 6; i++) {
      const row = rows[i]!;
      // Each data row takes two lines (one break inside the quoted field).
      equal(row.line, 2 * i, `R${i} line`);
      equal(row.cells[0], `R${i}`);
      assert(row.cells[1] === `${long}\n${"ü".repeat(i)}`, `R${i} text arrives whole`);
    }
    deepStrictEqual([rows[7]!.line, rows[7]!.cells], [14, ["END", "done"]]);
  });
});

Deno.test("streamCsvFile() rejects bytes that are not UTF-8 with a TypeError", async () => {
  // Unicode ch. 3: FC is never a well-formed UTF-8 byte (a Latin-1 "ü"); the decoder is
  // fatal, so the file is refused instead of read with U+FFFD in it.
  const bytes = new Uint8Array([...new TextEncoder().encode("id,name\n1,Gr"), 0xfc, 0x6e, 0x0a]);
  await withTempDir(async (dir) => {
    const path = await Deno.makeTempFile({ dir, suffix: ".csv" });
    await Deno.writeFile(path, bytes);
    let error: unknown;
    try {
      await streamCsvFile(path, () => {});
    } catch (e) {
      error = e;
    }
    assert(error instanceof TypeError, String(error));
  });
});

Deno.test("streamCsvFile() rejects with NotFound for a missing file", async () => {
  await withTempDir(async (dir) => {
    let error: unknown;
    try {
      await streamCsvFile(`${dir}/absent.csv`, () => {});
    } catch (e) {
      error = e;
    }
    assert(error instanceof Deno.errors.NotFound, String(error));
  });
});
