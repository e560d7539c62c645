/**
 * The starter notebook of a new analysis folder: invented example data, one `curb` template,
 * its equivalent API call, one comparison written with the API, and the cautions.
 *
 * @module
 */
import { KERNEL_DISPLAY_NAME, KERNEL_NAME } from "./jupyter.ts";

/** One notebook cell (nbformat 4.5). */
interface Cell {
  readonly cell_type: "markdown" | "code";
  readonly id: string;
  readonly metadata: Record<string, unknown>;
  readonly source: string[];
  readonly execution_count?: null;
  readonly outputs?: unknown[];
}

/** The plain cautions every analysis carries (also in the README stub). */
export const CAUTIONS = [
  "- **Extrapolation.** The model is only checked inside the range of the data it was fitted " +
  "on. Predictions outside the training domain are guesses; polynomial terms can swing far off " +
  "there.",
  "- **Validation error is an estimate, not a guarantee.** Cross-validation error comes from " +
  "these rows and these folds; new data can do worse, especially if it is collected " +
  "differently.",
];

function lines(text: string): string[] {
  const all = text.split("\n");
  return all.map((line, i) => (i < all.length - 1 ? `${line}\n` : line));
}

function markdown(id: string, text: string): Cell {
  return { cell_type: "markdown", id, metadata: {}, source: lines(text) };
}

function code(id: string, text: string): Cell {
  return {
    cell_type: "code",
    id,
    metadata: {},
    execution_count: null,
    outputs: [],
    source: lines(text),
  };
}

/**
 * The starter notebook as a JSON-ready object (nbformat 4.5, kernel "curbfit").
 *
 * @example
 * ```ts
 * import { starterNotebook } from "./starter.ts";
 * const nb = starterNotebook("kiln-drying");
 * console.log(nb.metadata.kernelspec.name, nb.cells.length); // curbfit 9
 * ```
 */
export function starterNotebook(title: string) {
  const cells: Cell[] = [
    markdown(
      "about",
      `# ${title}\n\n` +
        "A starting point. The example data below is invented (moisture of timber drying in a " +
        "kiln); replace it with your own table and edit the template.\n\n" +
        CAUTIONS.join("\n"),
    ),
    code(
      "setup",
      [
        'import { column, compare, curb, equivalentCall, legendre, ridge, tableFromColumns } from "curbfit";',
        "",
        '// Invented example data: replace with your own, e.g. `await readCsv("measurements.csv")`.',
        "const hours = Array.from({ length: 80 }, (_, i) => ((i * 37) % 80) / 4);",
        "const moisture = hours.map((h, i) => 30 * Math.exp(-h / 6) + 4 + 0.8 * Math.sin(12.9898 * i));",
        "const drying = tableFromColumns({ hours, moisture });",
      ].join("\n"),
    ),
    markdown(
      "template-intro",
      "## Describe the analysis\n\n" +
        "One statement per line; the vocabulary is in curbfit's `lib/magic/README.md`. The " +
        "progress line is replaced by the result when the sweep ends.",
    ),
    code(
      "template",
      [
        "const found = await curb`",
        "  data ${drying}",
        "  predict moisture",
        "  terms legendre hours degree 10",
        "  gamma rising 2",
        "  lambda 40 points",
        "  folds 5 seed 2024",
        "  rule one-se",
        "`;",
      ].join("\n"),
    ),
    markdown(
      "api-intro",
      "## The same in code\n\nThe API call the template ran, to copy into code and edit:",
    ),
    code("api-call", "equivalentCall(found)"),
    markdown(
      "compare-intro",
      "## Compare candidates with the API\n\n" +
        "Every candidate is validated on the same folds, so their errors are paired.",
    ),
    code(
      "compare",
      [
        "const comparison = compare(drying, [",
        '  { name: "straight line", terms: [column("hours")], lambdas: [0] },',
        "  {",
        '    name: "degree 10, rising γ",',
        '    terms: [legendre("hours", 10)],',
        '    penalty: ridge({ weights: "rising", exponent: 2 }),',
        '    rule: "one-se",',
        "  },",
        '], { target: "moisture", folds: { k: 5, seed: 2024 } });',
        "comparison",
      ].join("\n"),
    ),
    markdown(
      "next",
      "## Before you rely on it\n\n" + CAUTIONS.join("\n") + "\n\n" +
        "Write down the question, the data source and the chosen model in README.md.",
    ),
  ];
  return {
    cells,
    metadata: {
      kernelspec: { display_name: KERNEL_DISPLAY_NAME, language: "typescript", name: KERNEL_NAME },
      language_info: {
        codemirror_mode: "typescript",
        file_extension: ".ts",
        mimetype: "text/x.typescript",
        name: "typescript",
        nbconvert_exporter: "script",
        pygments_lexer: "typescript",
      },
    },
    nbformat: 4,
    nbformat_minor: 5,
  };
}
