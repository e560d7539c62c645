export * from "../mod.ts";
export { foldRows as foldRowsOf } from "../lib/folds/mod.ts";
