/** One section of docs/benchmarks.md: a titled table of measures. */
export interface BenchSection {
  title: string;
  rows: { name: string; value: string; note?: string }[];
}
