// Scratch arrays kept per length, so that the small matrices of one analysis are not allocated (and
// collected) on every call. Each user holds its own pool; a buffer is only valid until the same pool is
// asked for the same length again, so nothing taken from a pool may be returned to a caller.

export class ScratchPool {
  private readonly buffers: (Float64Array | undefined)[] = [];

  /** A buffer of exactly `length` entries with unspecified contents. */
  get(length: number): Float64Array {
    let b = this.buffers[length];
    if (b === undefined) {
      b = new Float64Array(length);
      this.buffers[length] = b;
    }
    return b;
  }

  /** A buffer of exactly `length` entries, all zero. */
  zeroed(length: number): Float64Array {
    const b = this.get(length);
    b.fill(0);
    return b;
  }
}
