/** Longest run of bytes without a line end kept before it is handed on as one (unreadable) line. */
export const MAX_PENDING_CHARS = 256;

/**
 * Splits what a balance sends into lines. CR, LF and CR LF each end a line, so a reading split
 * across two chunks, or a CR LF split between them, comes out once and whole.
 */
export class LineSplitter {
  private readonly decoder = new TextDecoder();
  private pending = '';
  private lastWasCR = false;

  push(chunk: Uint8Array | string): string[] {
    const text = typeof chunk === 'string' ? chunk : this.decoder.decode(chunk, { stream: true });
    const lines: string[] = [];
    for (const ch of text) {
      if (ch === '\n' && this.lastWasCR) {
        this.lastWasCR = false;
        continue;
      }
      this.lastWasCR = ch === '\r';
      if (ch === '\r' || ch === '\n') {
        lines.push(this.pending);
        this.pending = '';
      } else {
        this.pending += ch;
        // Noise at the wrong baud rate has no line ends; hand it on so the clerk is told.
        if (this.pending.length >= MAX_PENDING_CHARS) {
          lines.push(this.pending);
          this.pending = '';
        }
      }
    }
    return lines;
  }
}

/**
 * Reads a byte stream (a serial port's `readable`, or the simulated scale's HTTP body) line by line
 * until it ends or `stop` is called. `done` settles when reading has stopped, rejecting on a read error.
 */
export function pumpLines(stream: ReadableStream<Uint8Array>, onLine: (line: string) => void): { done: Promise<void>; stop: () => Promise<void> } {
  const reader = stream.getReader();
  const splitter = new LineSplitter();
  let stopped = false;
  const done = (async () => {
    try {
      for (;;) {
        const { value, done: ended } = await reader.read();
        if (ended || stopped) return;
        for (const line of splitter.push(value)) onLine(line);
      }
    } catch (err) {
      if (!stopped) throw err;
    } finally {
      reader.releaseLock();
    }
  })();
  return {
    done,
    stop: async () => {
      stopped = true;
      await reader.cancel().catch(() => {});
      await done.catch(() => {});
    },
  };
}
