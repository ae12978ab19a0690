/**
 * Streaming CSV reading. Bytes are decoded to text first (a TextDecoderStream keeps
 * multi-byte characters whole across chunks) and the decoded text is streamed into
 * papaparse. Each row comes with the 1-based line on which it starts, counting line
 * breaks inside quoted fields, so diagnostics point at the right line.
 */
import Papa from "papaparse";
import { Readable } from "node:stream";

export interface CsvRow {
  /** 1-based line where the row starts. */
  readonly line: number;
  readonly cells: readonly string[];
}

export interface CsvProblem {
  /** 1-based line of the row the problem belongs to. */
  readonly line: number;
  readonly message: string;
}

export interface CsvResult {
  readonly rows: CsvRow[];
  readonly problems: CsvProblem[];
}

/** Counts line breaks (LF, CRLF or a lone CR) inside a row's fields. */
function countBreaks(cells: readonly string[]): number {
  let n = 0;
  for (const cell of cells) {
    for (let i = 0; i < cell.length; i++) {
      const c = cell.charCodeAt(i);
      if (c === 10 || (c === 13 && cell.charCodeAt(i + 1) !== 10)) n++;
    }
  }
  return n;
}

/**
 * Prepares decoded chunks for papaparse: drops a leading byte-order mark (before parsing, so
 * a quoted first cell stays quoted) and holds text back until the first line break, since
 * papaparse guesses the line ending from its first chunk.
 */
async function* prepareChunks(
  chunks: AsyncIterable<string> | Iterable<string>,
): AsyncGenerator<string> {
  let head = "";
  let started = false;
  for await (const chunk of chunks) {
    if (started) {
      yield chunk;
      continue;
    }
    head += chunk;
    const breakAt = head.search(/[\r\n]/);
    // A CR at the very end may be the first half of a CRLF: wait for the next chunk.
    if (breakAt >= 0 && !(breakAt === head.length - 1 && head.endsWith("\r"))) {
      started = true;
      yield head.replace(/^\uFEFF/, "");
    }
  }
  if (!started && head !== "") yield head.replace(/^\uFEFF/, "");
}

/**
 * Parses CSV from a source of decoded text chunks, calling `onRow` per non-blank row.
 * Quote errors are returned as problems with their line.
 */
export function parseCsvChunks(
  chunks: AsyncIterable<string> | Iterable<string>,
  onRow: (row: CsvRow) => void,
): Promise<CsvProblem[]> {
  const problems: CsvProblem[] = [];
  let line = 1;
  return new Promise((resolve, reject) => {
    Papa.parse<string[]>(Readable.from(prepareChunks(chunks), { objectMode: true }), {
      header: false,
      skipEmptyLines: false,
      delimiter: ",",
      step(results) {
        const cells = results.data;
        const start = line;
        line += 1 + countBreaks(cells);
        for (const e of results.errors) {
          problems.push({ line: start, message: describePapaError(e.code, e.message) });
        }
        const blank = cells.length === 0 || (cells.length === 1 && (cells[0] ?? "").trim() === "");
        if (!blank) onRow({ line: start, cells });
      },
      complete() {
        resolve(problems);
      },
      error(e: Error) {
        reject(e);
      },
    });
  });
}

function describePapaError(code: string, message: string): string {
  if (code === "MissingQuotes") return "a quoted field is not closed";
  if (code === "InvalidQuotes") return "a field has a stray quote character";
  return message.charAt(0).toLowerCase() + message.slice(1);
}

/** Parses CSV text held in memory (tests, small tables) with the same parser. */
export async function parseCsvText(text: string): Promise<CsvResult> {
  const rows: CsvRow[] = [];
  const problems = await parseCsvChunks([text], (r) => rows.push(r));
  return { rows, problems };
}

/** Streams a CSV file from disk; rows are handed to `onRow` as they are parsed. */
export async function streamCsvFile(
  path: string,
  onRow: (row: CsvRow) => void,
): Promise<CsvProblem[]> {
  const file = await Deno.open(path, { read: true });
  const text = file.readable.pipeThrough(new TextDecoderStream("utf-8", { fatal: true }));
  return await parseCsvChunks(text, onRow);
}
