// careSchedule over 100,000 synthetic pieces with 3 layers each, judged as a ratio to its floor: the same
// rows walked with only the date arithmetic a schedule needs (the owner's local date of `now`, and per
// layer and for the yearly check a due date by month arithmetic and its distance in days), so what is
// measured is the engine's own work. At most 3× that floor (our choice, from a first run at 1.7×; 1.5 s on one core was the absolute
// target before). Run with `npm run bench` (tests/bench/run.ts) or `npx tsx tests/bench/care-schedule.bench.ts`. Data is synthetic.
import { careSchedule, FINISH_CLASSES, SUN_EXPOSURES, USES, type CareFinishLayer, type CareLogEntry, type CarePiece, type CatalogEntry } from "../../lib/care/index";
import { addMonths, diffDays, localDate, toEpochMs } from "../../lib/care/dates";
import { result } from "./result";

const PIECES = 100_000;
const RATIO_MAX = 3;

function pad(n: number): string {
  return String(n).padStart(2, "0");
}

const catalog: CatalogEntry[] = FINISH_CLASSES.map((finishClass, i) => ({
  id: `synthetic_${finishClass}`,
  finishClass,
  coverageM2PerL: 20 + i,
  containerSizesMl: [250, 1000],
  ...(i % 2 === 0 ? { intervals: { heavy: 10 + i } } : {}),
}));

const inputs = Array.from({ length: PIECES }, (_, i) => {
  const year = 2018 + (i % 8);
  const month = 1 + (i % 12);
  const day = 1 + (i % 28);
  const deliveredOn = `${year}-${pad(month)}-${pad(day)}`;
  const piece: CarePiece = {
    id: `synthetic_${i}`,
    kind: "dining_table",
    use: USES[i % USES.length]!,
    sun: SUN_EXPOSURES[i % SUN_EXPOSURES.length]!,
    deliveredOn,
    resin: i % 3 === 0 ? "deep_pour" : "none",
  };
  const finishLayers: CareFinishLayer[] = [0, 1, 2].map((k) => ({
    id: `l${i}_${k}`,
    surface: k === 2 ? "base" : "top",
    finishClass: FINISH_CLASSES[(i + k * 2) % FINISH_CLASSES.length]!,
    productId: `synthetic_${FINISH_CLASSES[(i + k * 2) % FINISH_CLASSES.length]}`,
    coats: 1 + k,
    appliedOn: `${year + (k === 1 ? 1 : 0)}-${pad(month)}-${pad(day)}`,
  }));
  const careLog: CareLogEntry[] = i % 4 === 0 ? [{ taskKind: "annual_check", doneOn: `${year + 1}-${pad(month)}-${pad(day)}` }] : [];
  return { piece, finishLayers, careLog };
});

const now = "2026-06-15T12:00:00Z";
const run = () => {
  let tasks = 0;
  for (const input of inputs) tasks += careSchedule({ ...input, catalog, now, timeZone: "America/New_York" }).tasks.length;
  return tasks;
};

/** The floor: the same rows, only the date arithmetic. */
const floorRun = () => {
  let sink = 0;
  for (const { piece, finishLayers } of inputs) {
    const today = localDate(toEpochMs(now), "America/New_York");
    for (const l of finishLayers) sink += diffDays(today, addMonths(l.appliedOn, 12));
    sink += diffDays(today, addMonths(piece.deliveredOn, 12));
  }
  return sink;
};

run(); // warm-up (JIT), not timed
floorRun();
// Three timed runs; the best one is judged, since other processes on a shared machine only ever add time.
const timings: number[] = [];
let tasks = 0;
for (let i = 0; i < 3; i++) {
  const start = performance.now();
  tasks = run();
  timings.push(performance.now() - start);
}
const elapsedMs = Math.min(...timings);
const floorTimings: number[] = [];
for (let i = 0; i < 3; i++) {
  const start = performance.now();
  floorRun();
  floorTimings.push(performance.now() - start);
}
const floorMs = Math.min(...floorTimings);
const ratio = elapsedMs / floorMs;
const perSecond = Math.round(PIECES / (elapsedMs / 1000));
console.log(
  `careSchedule: ${PIECES} pieces × 3 layers → ${tasks} tasks; best of 3: ${elapsedMs.toFixed(0)} ms ` +
    `(${perSecond.toLocaleString("en-US")} pieces/s; runs ${timings.map((t) => t.toFixed(0)).join(", ")} ms)`,
);
console.log(`floor: the same rows with only the date arithmetic, best of 3: ${floorMs.toFixed(0)} ms (runs ${floorTimings.map((t) => t.toFixed(0)).join(", ")} ms); ratio ${ratio.toFixed(2)} (target ≤ ${RATIO_MAX})`);
result({ figure: `careSchedule over ${PIECES.toLocaleString("en-US")} pieces × 3 layers (best of 3)`, target: `≤ ${RATIO_MAX}× floor`, measured: `${elapsedMs.toFixed(0)} ms`, floor: `date arithmetic only ${floorMs.toFixed(0)} ms`, ratio, ok: ratio <= RATIO_MAX });
