import { describe, expect, it } from 'vitest';
import { LineSplitter, MAX_PENDING_CHARS, pumpLines } from '@/features/scale/stream';

const bytes = (s: string) => new TextEncoder().encode(s);

function streamOf(chunks: string[]): ReadableStream<Uint8Array> {
  return new ReadableStream({
    start(controller) {
      for (const c of chunks) controller.enqueue(bytes(c));
      controller.close();
    },
  });
}

describe('splitting what a balance sends into lines', () => {
  it('ends a line at CR LF, CR or LF, once each', () => {
    const s = new LineSplitter();
    expect(s.push(bytes('ST,GS,+  1.000 g\r\nST,GS,+  2.000 g\rST,GS,+  3.000 g\n'))).toEqual(['ST,GS,+  1.000 g', 'ST,GS,+  2.000 g', 'ST,GS,+  3.000 g']);
  });

  it('joins a reading split across chunks, and a CR LF split between two chunks gives one line end', () => {
    const s = new LineSplitter();
    expect(s.push(bytes('ST,GS,+ 12'))).toEqual([]);
    expect(s.push(bytes('.345 g\r'))).toEqual(['ST,GS,+ 12.345 g']);
    expect(s.push(bytes('\nS S   1.0 g\r\n'))).toEqual(['S S   1.0 g']);
  });

  it('keeps empty lines (the parser skips them) so a blank line between readings is not glued to the next', () => {
    expect(new LineSplitter().push('\r\n\r\n+ 1 g\r\n')).toEqual(['', '', '+ 1 g']);
  });

  it('hands on a run without line ends, as noise at the wrong baud rate would be', () => {
    const s = new LineSplitter();
    const lines = s.push('\x7f'.repeat(MAX_PENDING_CHARS + 10));
    expect(lines).toHaveLength(1);
    expect(lines[0]).toHaveLength(MAX_PENDING_CHARS);
  });
});

describe('pumping a byte stream', () => {
  it('delivers every line of a stream in order and settles when it ends', async () => {
    const seen: string[] = [];
    const pump = pumpLines(streamOf(['ST,GS,+ 1', '.5 g\r\nUS,GS', ',+ 1.6 g\r\n']), (l) => seen.push(l));
    await pump.done;
    expect(seen).toEqual(['ST,GS,+ 1.5 g', 'US,GS,+ 1.6 g']);
  });

  it('stops on request while the stream is still open', async () => {
    let controller!: ReadableStreamDefaultController<Uint8Array>;
    const stream = new ReadableStream<Uint8Array>({ start: (c) => void (controller = c) });
    const seen: string[] = [];
    const pump = pumpLines(stream, (l) => seen.push(l));
    controller.enqueue(bytes('+ 1 g\r\n'));
    await new Promise((r) => setTimeout(r, 10));
    await pump.stop();
    await expect(pump.done).resolves.toBeUndefined();
    expect(seen).toEqual(['+ 1 g']);
  });

  it('rejects done when the stream fails (a cable pulled out)', async () => {
    const stream = new ReadableStream<Uint8Array>({
      pull: (c) => c.error(new Error('device lost')),
    });
    await expect(pumpLines(stream, () => {}).done).rejects.toThrow('device lost');
  });
});
