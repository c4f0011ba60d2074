/**
 * Typed arrays reused from one matching request to the next. A request over 100 000 parts
 * needs some 15 MB of working arrays; allocated afresh each time they make the collector walk
 * the whole candidate cache every few requests. Matching runs synchronously, so one buffer per
 * purpose is enough: a caller takes a view, uses it and lets it go before returning.
 */
type Typed = Float64Array | Int32Array | Uint32Array | Uint8Array;

class Scratch<T extends Typed> {
  private buffer: T;
  constructor(private readonly make: (n: number) => T) {
    this.buffer = make(0);
  }
  /** A view of `n` elements; its contents are whatever the last user left unless `fill` is given. */
  take(n: number, fill?: number): T {
    if (this.buffer.length < n) this.buffer = this.make(Math.max(n, Math.ceil(this.buffer.length * 1.25)));
    const view = this.buffer.subarray(0, n) as T;
    if (fill !== undefined) view.fill(fill);
    return view;
  }
}

export const float64Scratch = () => new Scratch((n) => new Float64Array(n));
export const int32Scratch = () => new Scratch((n) => new Int32Array(n));
export const uint32Scratch = () => new Scratch((n) => new Uint32Array(n));
export const uint8Scratch = () => new Scratch((n) => new Uint8Array(n));
