/**
 * Reading a record's data file again the way its sweep read it, so that `verify` sees the same
 * rows: the recorded field separator, the recorded missing-value policy, and recorded category
 * columns read as categories even when their levels look like numbers.
 *
 * @module
 */
import { readCsv } from "../table/mod.ts";
import type { CsvOptions, Table } from "../table/mod.ts";
import { DEFAULT_SEPARATOR } from "../table/separator.ts";
import { parseRecord } from "./parse.ts";
import type { ModelChoiceRecord } from "./schema.ts";

/**
 * Options of `readRecordedData`.
 *
 * @example
 * ```ts
 * import type { RecordedReadOptions } from "./read.ts";
 * const tabs: RecordedReadOptions = { fieldSeparator: "\t" };
 * ```
 */
export interface RecordedReadOptions {
  /**
   * Read with this field separator instead of the one the record names (`data.fieldSeparator`,
   * a comma when it names none). The rows, not the separator, are what `verify` compares; its
   * report notes a separator that differs from the record's.
   */
  readonly fieldSeparator?: string;
}

/**
 * The field separator a record's data was read with: `data.fieldSeparator`, or the comma when
 * the record names none (comma CSV, rows or columns in memory, and records written before
 * curbfit kept the separator).
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * import { recordOf } from "./build.ts";
 * import { recordedSeparator } from "./read.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i / 19);
 * const s = sweep({ x, y: x.map((v, i) => v * v + 0.1 * Math.sin(5 * i)) }, {
 *   target: "y", terms: [legendre("x", 3)], folds: { k: 4, seed: 2 },
 * });
 * console.log(recordedSeparator(recordOf(s))); // ","
 * ```
 */
export function recordedSeparator(record: ModelChoiceRecord): string {
  return record.data.fieldSeparator ?? DEFAULT_SEPARATOR;
}

/**
 * Reads the CSV file at `path` as the record's sweep read its data: with the recorded field
 * separator (or `options.fieldSeparator`), the recorded missing-value policy, and the recorded
 * category columns as categories. The result goes to `verify(record, table)`.
 *
 * @throws {CurbfitError} `BAD_RECORD` for a record that cannot be read; the CSV loader's errors
 * (e.g. `BAD_OPTION` naming `fieldSeparator` when the header line holds another separator).
 *
 * @example
 * ```ts
 * import { readCsv, legendre, sweep } from "../../mod.ts";
 * import { recordJson } from "./json.ts";
 * import { readRecordedData } from "./read.ts";
 * import { verify } from "./verify.ts";
 * const path = await Deno.makeTempFile({ suffix: ".csv" });
 * const lines = Array.from({ length: 24 }, (_, i) => `${i / 23};${Math.cos(3 * i / 23) + 0.01 * (i % 5)}`);
 * await Deno.writeTextFile(path, ["x;y", ...lines].join("\n") + "\n");
 * const s = sweep(await readCsv(path, { fieldSeparator: ";" }), {
 *   target: "y", terms: [legendre("x", 4)], folds: { k: 4, seed: 6 },
 * });
 * const json = recordJson(s); // its data section holds "fieldSeparator": ";"
 * console.log(verify(json, await readRecordedData(json, path)).ok); // true
 * ```
 */
export async function readRecordedData(
  record: unknown,
  path: string,
  options: RecordedReadOptions = {},
): Promise<Table> {
  const rec = parseRecord(record);
  const base: CsvOptions = {
    source: path,
    missing: rec.data.missing.policy,
    fieldSeparator: options.fieldSeparator ?? recordedSeparator(rec),
  };
  const table = await readCsv(path, base);
  const categories = rec.data.columns.filter((c) =>
    c.kind === "category" && table.columns.get(c.name)?.kind === "number"
  );
  if (categories.length === 0) return table;
  const types = Object.fromEntries(categories.map((c) => [c.name, "category" as const]));
  return await readCsv(path, { ...base, types });
}
