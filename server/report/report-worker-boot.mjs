// Entry of the report's measuring worker. The server runs its TypeScript
// through tsx, whose loader does not reach worker threads on Node 20, so the
// worker registers it itself before loading report-worker.ts.
import { tsImport } from 'tsx/esm/api';

await tsImport('./report-worker.ts', import.meta.url);
