/**
 * One benchmark result. bench/run.ts prints it as
 * `bench <name>: <measured> <unit> goal <op> <goal> <pass|MISS>`.
 */
export interface BenchLine {
  /** Short name (no colon). */
  name: string;
  measured: number;
  unit: string;
  /** The goal is met when `measured <op> goal`. */
  op: '<=' | '>=';
  goal: number;
  /** Context printed on stderr (not part of the line format). */
  note?: string;
}

/** A benchmark module: bench/<name>.bench.ts exporting `run`. */
export interface BenchModule {
  run(): Promise<BenchLine[]>;
}
