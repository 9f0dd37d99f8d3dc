/**
 * A garbage collection on call, for cost's runs (util/collect.ts collectBetweenRuns): the flag set
 * now reaches the worker threads' contexts, made later; this context gets the function from a new
 * one. Imported first by bin.ts: the command's process only, never a library user's.
 */
import { setFlagsFromString } from "node:v8";
import { runInNewContext } from "node:vm";

setFlagsFromString("--expose-gc");
(globalThis as { gc?: unknown }).gc ??= runInNewContext("gc");
