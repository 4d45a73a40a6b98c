// A ring of equal slots of doubles in shared memory between two threads: one writes slots in
// order, the other reads them in the same order. The writer runs ahead by up to `slots` slots and
// waits when the ring is full; the reader waits when it is empty. Either side can stop the ring
// (the reader when it needs no more, the writer when it fails, with a message); the writer also
// says when it has finished, so a reader is never left waiting for slots that will not come. Plain JavaScript
// (SharedArrayBuffer and Atomics): the same in Node's worker threads and in a browser's Workers.
// Atomics.wait blocks, which the reader may do on Node's main thread or in a Worker, not on a
// page's main thread.

const WRITTEN = 0;
const READ = 1;
const STOPPED = 2;
const FAILED = 3;
const FINISHED = 4;
/** Set while a side sleeps, so the other wakes it only then (a wake-up per slot cost more than the copy). */
const WRITER_ASLEEP = 5;
const READER_ASLEEP = 6;
/** Int32 words of control before the failure message's bytes. */
const WORDS = 7;
const MESSAGE_BYTES = 1024;

/** How long a reader waits on a writer that makes no progress before it gives up, ms. */
const STALL_MS = 120_000;

export interface SlotRingBuffers {
  control: SharedArrayBuffer;
  data: SharedArrayBuffer;
  slotDoubles: number;
  slots: number;
}

export class SlotRing {
  readonly buffers: SlotRingBuffers;
  private readonly control: Int32Array;
  private readonly views: Float64Array[];
  private written = 0;
  private read = 0;

  /** A new ring, or (with `buffers`) the other end of an existing one. */
  constructor(slotDoubles: number, slots: number, buffers?: SlotRingBuffers) {
    this.buffers = buffers ?? {
      control: new SharedArrayBuffer(WORDS * 4 + MESSAGE_BYTES),
      data: new SharedArrayBuffer(slotDoubles * slots * 8),
      slotDoubles,
      slots,
    };
    const b = this.buffers;
    this.control = new Int32Array(b.control, 0, WORDS);
    this.views = Array.from({ length: b.slots }, (_, k) => new Float64Array(b.data, k * b.slotDoubles * 8, b.slotDoubles));
  }

  static attach(buffers: SlotRingBuffers): SlotRing {
    return new SlotRing(buffers.slotDoubles, buffers.slots, buffers);
  }

  get stopped(): boolean {
    return Atomics.load(this.control, STOPPED) !== 0;
  }

  /**
   * Writer: the next slot to fill; null once the reader has stopped the ring. On a full ring it
   * sleeps until the reader has emptied half of it, so the two threads do not wake each other for
   * every slot.
   */
  nextFree(): Float64Array | null {
    const c = this.control;
    const slots = this.buffers.slots;
    if (Atomics.load(c, STOPPED) !== 0) return null;
    if (this.written - Atomics.load(c, READ) < slots) return this.views[this.written % slots];
    for (;;) {
      Atomics.store(c, WRITER_ASLEEP, 1);
      const read = Atomics.load(c, READ);
      if (Atomics.load(c, STOPPED) !== 0 || this.written - read <= slots / 2) break;
      Atomics.wait(c, READ, read, 1000);
    }
    Atomics.store(c, WRITER_ASLEEP, 0);
    return Atomics.load(c, STOPPED) !== 0 ? null : this.views[this.written % slots];
  }

  /** Writer: the slot from nextFree is filled. A sleeping reader is woken once a quarter of the ring is filled. */
  publish(): void {
    this.written++;
    const c = this.control;
    Atomics.store(c, WRITTEN, this.written);
    if (Atomics.load(c, READER_ASLEEP) !== 0 && this.written - Atomics.load(c, READ) >= this.buffers.slots / 4) Atomics.notify(c, WRITTEN);
  }

  /**
   * Reader: the next filled slot, after waiting for it (the writer wakes it when a quarter of the
   * ring is filled or it has finished, else it looks again every 250 ms). Throws when the writer
   * failed or stalled.
   */
  nextFull(): Float64Array {
    const c = this.control;
    let waited = 0;
    if (Atomics.load(c, WRITTEN) > this.read) return this.views[this.read % this.buffers.slots];
    try {
      for (;;) {
        Atomics.store(c, READER_ASLEEP, 1);
        const written = Atomics.load(c, WRITTEN);
        if (written > this.read) return this.views[this.read % this.buffers.slots];
        if (Atomics.load(c, FAILED) !== 0) throw new Error(`the second render thread failed: ${this.failure()}`);
        if (Atomics.load(c, FINISHED) !== 0 && Atomics.load(c, WRITTEN) === written)
          throw new Error('the second render thread ended before the input did');
        if (waited >= STALL_MS) throw new Error(`the second render thread made no progress for ${STALL_MS / 1000} s`);
        if (Atomics.wait(c, WRITTEN, written, 250) === 'timed-out') waited += 250;
      }
    } finally {
      Atomics.store(c, READER_ASLEEP, 0);
    }
  }

  /** Reader: done with the slot from nextFull. */
  release(): void {
    this.read++;
    const c = this.control;
    Atomics.store(c, READ, this.read);
    if (Atomics.load(c, WRITER_ASLEEP) !== 0 && Atomics.load(c, WRITTEN) - this.read <= this.buffers.slots / 2) Atomics.notify(c, READ);
  }

  /** Reader: no more slots are needed (the writer's nextFree returns null). */
  stop(): void {
    Atomics.store(this.control, STOPPED, 1);
    Atomics.notify(this.control, READ);
  }

  /** Writer: it cannot go on; the reader's nextFull throws with this message. */
  fail(message: string): void {
    const bytes = new Uint8Array(this.buffers.control, WORDS * 4, MESSAGE_BYTES);
    // TextEncoder does not write into shared memory: encode, then copy.
    const text = new TextEncoder().encode(message).subarray(0, MESSAGE_BYTES - 1);
    bytes.fill(0);
    bytes.set(text);
    Atomics.store(this.control, FAILED, 1);
    Atomics.notify(this.control, WRITTEN);
  }

  /** Writer: it has written all it will (after the last publish, or after a failure). */
  finish(): void {
    Atomics.store(this.control, FINISHED, 1);
    Atomics.notify(this.control, WRITTEN);
  }

  private failure(): string {
    const bytes = new Uint8Array(this.buffers.control, WORDS * 4, MESSAGE_BYTES);
    const end = bytes.indexOf(0);
    // TextDecoder does not take views of shared memory: copy the bytes out first.
    return new TextDecoder().decode(bytes.slice(0, end < 0 ? MESSAGE_BYTES : end));
  }
}
