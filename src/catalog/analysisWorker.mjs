// Worker bootstrap: registers tsx in this thread (module hooks are per thread), then loads the TypeScript worker.
import { register } from "tsx/esm/api";

register();
await import("./analysisWorker.ts");
