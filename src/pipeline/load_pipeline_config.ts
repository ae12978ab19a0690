/** Reading a pipeline config file from disk. */
import { type Diagnostic, makeDiagnostic } from "../model/diagnostic.ts";
import { parsePipelineConfig, type PipelineConfig } from "./pipeline_config.ts";

/**
 * Reads and parses the pipeline config at `path`. A missing or unreadable file, or one that is
 * not UTF-8 text, gives `config.unreadable` and no value; everything else is as
 * parsePipelineConfig reports it.
 */
export async function loadPipelineConfig(
  path: string,
): Promise<{ value: PipelineConfig | undefined; diagnostics: Diagnostic[] }> {
  let text: string;
  try {
    // Bytes decoded strictly: Deno.readTextFile would replace bad bytes without a word.
    text = new TextDecoder("utf-8", { fatal: true }).decode(await Deno.readFile(path));
  } catch (e) {
    const why = e instanceof Deno.errors.NotFound
      ? "there is no such file"
      : e instanceof TypeError
      ? "it is not valid UTF-8 text"
      : e instanceof Error
      ? e.message
      : String(e);
    return {
      value: undefined,
      diagnostics: [makeDiagnostic(
        "config.unreadable",
        "error",
        `Cannot read pipeline config "${path}": ${why}`,
        { at: { file: path }, found: path, expected: "a readable UTF-8 JSON file" },
      )],
    };
  }
  return parsePipelineConfig(text, path);
}
