/** Where emitters write: text chunks, in order. A file writer batches them; a test collects them. */
export type Sink = (chunk: string) => void;

/** Collects a whole emitted text (for tests and small outputs). */
export function collect(emit: (sink: Sink) => void): string {
  const parts: string[] = [];
  emit((s) => parts.push(s));
  return parts.join("");
}

/** Batches many small writes into chunks of about `size` characters before passing them on. */
export function batched(sink: Sink, size = 1 << 16): { write: Sink; flush: () => void } {
  let buf: string[] = [];
  let len = 0;
  return {
    write(s) {
      buf.push(s);
      len += s.length;
      if (len >= size) {
        sink(buf.join(""));
        buf = [];
        len = 0;
      }
    },
    flush() {
      if (len > 0) sink(buf.join(""));
      buf = [];
      len = 0;
    },
  };
}
