/**
 * Writes the invented demo dataset examples/data/orchard.csv (a scenario of our own; the numbers
 * are simulated, not measured). A community orchard samples apples through the season and
 * records their sugar content (°Brix) against days since blossom, the share of the day the tree
 * stands in shade, and how it is watered. Sugar climbs, levels off and sags a little late in the
 * season, so a single input wants a flexible curve; 36 rows make overfitting easy.
 *
 * Run: deno run --allow-write examples/data/make_orchard.ts
 */
import { SeededStream } from "../../lib/folds/mod.ts";

const ROWS = 36;
const stream = new SeededStream(20261201);

function normal(): number {
  const u = 1 - stream.nextDouble();
  const v = stream.nextDouble();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

const lines = ["days_since_blossom,shade_share,watering,brix"];
for (let i = 0; i < ROWS; i++) {
  const days = Math.round(60 + 110 * stream.nextDouble());
  const shade = Math.round(100 * (0.1 + 0.5 * stream.nextDouble())) / 100;
  const watering = stream.nextBelow(2) === 0 ? "drip" : "rain-fed";
  const t = (days - 60) / 110;
  const season = 8 + 7 * (1 - Math.exp(-3.2 * t)) - 1.6 * t ** 4;
  const brix = season - 2.2 * shade + (watering === "drip" ? -0.4 : 0) + 0.7 * normal();
  lines.push(`${days},${shade},${watering},${brix.toFixed(2)}`);
}
await Deno.writeTextFile(new URL("./orchard.csv", import.meta.url), lines.join("\n") + "\n");
console.log(`wrote ${ROWS} rows to examples/data/orchard.csv`);
